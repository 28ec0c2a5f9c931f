/*
 * constants.h - the physical and conversion constants every layer uses,
 * defined once.
 */
#ifndef DK_CONSTANTS_H
#define DK_CONSTANTS_H

/* Speed of light in vacuum, m/s (exact, SI). */
#define DK_C_M_PER_S 299792458.0

/* Speed of light in µm/fs (= 1e6 µm/m × 1e-15 s/fs × c). */
#define DK_C_UM_PER_FS 0.299792458

/* Vacuum permittivity, F/m (CODATA 2018). */
#define DK_EPS0_F_PER_M 8.8541878128e-12

/* Reduced Planck constant, J s (exact in the 2019 SI). */
#define DK_HBAR_J_S 1.054571817e-34

/* π to double precision (math.h's M_PI is not in ISO C). */
#define DK_PI 3.14159265358979323846

/* Radians per degree. */
#define DK_RAD_PER_DEG (DK_PI / 180.0)

/* Absolute zero in °C. */
#define DK_ABSOLUTE_ZERO_C (-273.15)

#endif /* DK_CONSTANTS_H */
