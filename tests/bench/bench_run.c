/*
 * bench_run.c - wall time of a whole command, start-up included: runs
 * "PROGRAM ARGS..." @runs times (fork, exec, wait; output to /dev/null)
 * after one warm-up run and prints the best and the median in ms:
 *
 *   bench_run RUNS PROGRAM [ARGS...]  →  "best_ms median_ms status"
 *
 * Measured with CLOCK_MONOTONIC around each child; never asserts.
 */
#include <fcntl.h>
#include <stdio.h>
#include <stdlib.h>
#include <sys/wait.h>
#include <time.h>
#include <unistd.h>

static double
now(void)
{
    struct timespec ts;
    clock_gettime(CLOCK_MONOTONIC, &ts);
    return ts.tv_sec + 1e-9 * ts.tv_nsec;
}

static int
run_once(char **argv, double *ms)
{
    double t0 = now();
    pid_t pid = fork();
    if (pid < 0)
        return -1;
    if (pid == 0) {
        int fd = open("/dev/null", O_WRONLY);
        if (fd >= 0) {
            dup2(fd, 1);
            dup2(fd, 2);
        }
        execv(argv[0], argv);
        _exit(127);
    }
    int status = 0;
    if (waitpid(pid, &status, 0) < 0)
        return -1;
    *ms = (now() - t0) * 1e3;
    return WIFEXITED(status) ? WEXITSTATUS(status) : -1;
}

static int
by_value(const void *a, const void *b)
{
    double x = *(const double *)a, y = *(const double *)b;
    return (x > y) - (x < y);
}

int
main(int argc, char **argv)
{
    if (argc < 3) {
        fprintf(stderr, "usage: bench_run RUNS PROGRAM [ARGS...]\n");
        return 2;
    }
    int runs = atoi(argv[1]);
    if (runs < 1 || runs > 1000)
        runs = 10;
    double *t = malloc(runs * sizeof *t), warm;
    if (!t)
        return 1;
    int st = run_once(argv + 2, &warm);
    for (int i = 0; i < runs && st >= 0; i++)
        st = run_once(argv + 2, &t[i]);
    if (st < 0) {
        fprintf(stderr, "bench_run: cannot run %s\n", argv[2]);
        return 1;
    }
    qsort(t, runs, sizeof *t, by_value);
    printf("%.2f %.2f %d\n", t[0], t[runs / 2], st);
    free(t);
    return 0;
}
