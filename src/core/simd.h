/*
 * simd.h - run-time dispatch of the hot vectorised kernels (internal).
 *
 * The default build targets the x86-64 baseline (SSE2) and must run on any
 * machine; DK_CLONES asks GCC for extra AVX2 and AVX-512 builds of a
 * kernel and an ifunc resolver that picks one when the program starts
 * (GCC's target_clones). The clones compute the same IEEE operations in
 * the same order (no -ffast-math; ISO C mode keeps FMA contraction off),
 * so their results equal the baseline's bit for bit. Elsewhere (another
 * compiler or architecture) DK_CLONES is empty and the portable build is
 * used.
 */
#ifndef DK_SIMD_H
#define DK_SIMD_H

#if defined(__x86_64__) && defined(__GNUC__) && !defined(__clang__) && \
    defined(__has_attribute) && !defined(__SANITIZE_ADDRESS__)
#if __has_attribute(target_clones)
#define DK_CLONES __attribute__((target_clones("default", "avx2", "avx512f")))
#endif
#endif
#ifndef DK_CLONES
#define DK_CLONES
#endif

/* A small function that must be inlined into every clone of a kernel
 * (a call inside the loop would stop its vectorisation). */
#if defined(__GNUC__)
#define DK_INLINE static inline __attribute__((always_inline))
#else
#define DK_INLINE static inline
#endif

#endif /* DK_SIMD_H */
