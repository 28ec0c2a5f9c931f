/*
 * command.h - deltak's commands as library calls: the same option
 * parsing, validation, answers and bytes as the `deltak` program, written
 * into buffers instead of the terminal. The Python module and the local
 * page of `deltak explore` answer through this, so that a program, a
 * notebook and a browser get exactly what the command line gives.
 *
 * Calls are independent and may run in several threads at once (each
 * thread keeps its own notes and output streams). `run` and `explore`
 * start processes or servers and are refused here.
 */
#ifndef DK_COMMAND_H
#define DK_COMMAND_H

#include <stddef.h>

typedef struct dk_command_result {
    int exit_code;   /* 0 answered, 1 no answer or failure, 2 bad usage */
    char *out;       /* what the command printed on standard output */
    size_t nout;
    char *err;       /* its messages (errors, warnings, notes) */
    size_t nerr;
} dk_command_result;

/*
 * dk_command_run:
 * @argc, @argv: the command and its options as on the command line, e.g.
 *   {"period", "--crystal", "MgO:LN", "--fundamental", "1064nm",
 *    "--json"}; argv[0] is the command name
 * @res: filled; release with dk_command_result_free()
 *
 * Returns: the exit code (also in res->exit_code); 2 for an unknown
 * command or `run`/`explore`; 1 when out of memory (with res->err set
 * when possible).
 */
int dk_command_run(int argc, const char *const *argv,
                   dk_command_result *res);

void dk_command_result_free(dk_command_result *res);

/* The command names, in a NULL-terminated list (for completion and
 * suggestions). */
const char *const *dk_command_names(void);

#endif /* DK_COMMAND_H */
