/*
 * cli.h - helpers shared by the command files: messages, the database,
 * warnings, and output that appears only once a command has succeeded.
 *
 * Exit codes: 0 success, 1 the request failed (message on stderr),
 * 2 bad usage (message and usage on stderr).
 */
#ifndef DK_CLI_H
#define DK_CLI_H

#include <json-c/json.h>
#include <stdio.h>

#include "deltak/crystal.h"
#include "deltak/dispersion.h"
#include "deltak/interaction.h"
#include "deltak/notes.h"
#include "deltak/plot.h"

#define CLI_FAIL 1
#define CLI_USAGE 2

/* Output modes (cli_set_output_mode). */
#define CLI_TEXT 0
#define CLI_JSON 1
#define CLI_CSV 2

/* Levenshtein distance of two short words (99 beyond 64 characters), for
 * "did you mean" suggestions. */
int cli_edit_distance(const char *a, const char *b);

/* Text from the user or a file made safe to print (control characters
 * shown as \xNN). Returns @buf. */
const char *cli_escape(const char *text, char *buf, size_t n);

/* This thread's standard output and error: the process's, or the
 * buffers of an in-process call (deltak/command.h). Commands never write
 * to stdout or stderr directly. */
FILE *cli_stdout(void);
FILE *cli_stderr(void);

/* Make @out and @err this thread's streams (NULL: the process's) and
 * start with no notes, in text mode. */
void cli_set_streams(FILE *out, FILE *err);

/* A text field for CSV: as it is, or quoted (RFC 4180) when it holds a
 * comma, quote or line break. Returns @buf. */
const char *cli_csv(const char *text, char *buf, size_t n);

/* Print "error: ..." on stderr; returns CLI_FAIL. */
int cli_error(const char *fmt, ...)
#if defined(__GNUC__)
    __attribute__((format(printf, 1, 2)))
#endif
    ;

/* Print "error: ...", then the usage lines; returns CLI_USAGE. */
int cli_usage_error(const char *const usage[], const char *fmt, ...)
#if defined(__GNUC__)
    __attribute__((format(printf, 2, 3)))
#endif
    ;

/* Print the usage lines on @f. */
void cli_print_usage(FILE *f, const char *const usage[]);

/*
 * Notes: everything an answer rests on. Design notes (deltak/notes.h) and
 * the command's own warnings are collected here. Text answers end with
 * "assumed: ..." lines for the choices made by default (cli_out_commit
 * adds them); warnings, range flags and cautions go to stderr
 * (cli_warnings_flush, called by main) and, in JSON, to "warnings"
 * (texts) and "notes" (kind, code, text); CSV rows carry the codes in a
 * flags column (cli_csv_flags).
 */

/* Add a design's notes. */
void cli_take_notes(const dk_notes *n);
/* Put the default choices and from-memory numbers noted so far under the
 * figure as a footnote (short forms), so the figure says what it rests
 * on. */
dk_status cli_plot_add_notes(dk_plot *fig, dk_error *err);

/* Take back the note @code: a choice a later step made moot. */
void cli_drop_note(const char *code);

/* Text, JSON or CSV: how notes are shown (set by cli_common_finish). */
void cli_set_output_mode(int mode);

/* Print the default choices as "assumed: ..." lines on @f. */
void cli_print_assumed(FILE *f);

/* Add "warnings" and "notes" to @obj. */
void cli_notes_to_json(json_object *obj);

/* The CSV flag column: codes of the default choices and from-memory data,
 * then the range codes of @range. Returns @buf. */
const char *cli_csv_flags(unsigned range, int shg, char *buf, size_t n);

/* "flags": [codes] in @obj when @range has any (DK_RANGE_* flags). */
void cli_flags_json(json_object *obj, unsigned range, int shg);

/* "  [extrapolated: idler, temperature]" and a newline when @range has
 * any flags; nothing otherwise. */
void cli_flags_text(FILE *f, unsigned range, int shg);

/* The columns text output keeps within (tables by their formats,
 * explanations by cli_wrap). */
#define CLI_WIDTH 79

/* @text folded to CLI_WIDTH columns: @lead before the first line, @hang
 * before each further one, a newline at the end (wrap.c). */
void cli_wrap(FILE *f, const char *lead, const char *hang, const char *text);

/* The same for a printf-style text. */
void cli_wrapf(FILE *f, const char *lead, const char *hang, const char *fmt,
               ...)
#if defined(__GNUC__)
    __attribute__((format(printf, 4, 5)))
#endif
    ;

/*
 * Strict numbers for options: no empty text, NaN, infinity, hexadecimal
 * or trailing characters, and inside [lo, hi]. Print the error with the
 * option name and return CLI_USAGE, or 0.
 */
int cli_real(const char *opt, const char *text, double lo, double hi,
             double *out, const char *const usage[]);
int cli_int(const char *opt, const char *text, long lo, long hi, int *out,
            const char *const usage[]);
/* Degrees in the text, radians out. */
int cli_angle(const char *opt, const char *text, double lo_deg, double hi_deg,
              double *rad, const char *const usage[]);

/* Record a warning (duplicates are dropped). Printed by cli_finish(). */
void cli_warn(const char *fmt, ...)
#if defined(__GNUC__)
    __attribute__((format(printf, 1, 2)))
#endif
    ;

/* Record the laser-safety caution (commands whose numbers size a working
 * source: gain, simulate). */
void cli_caution_laser(void);

/* Add the recorded warnings to @obj as "warnings": [...] (if any). */
void cli_warnings_to_json(json_object *obj);

/* Print the recorded warnings on stderr as "warning: ..." and forget them. */
void cli_warnings_flush(void);

/* Record the range warnings of one index evaluation, and that @set is
 * typed from memory when it is. */
void cli_warn_index(const dk_dispersion_set *set, unsigned flags,
                    double lambda_um, double temp_c);

/*
 * Load the crystal database: the folders and files of $DELTAK_CRYSTALS
 * (colon-separated, the first wins), then the shipped folder
 * (dk_db_shipped_dir). With the shipped folder alone and a crystal @name,
 * only that crystal's file is read when the files show which one it is
 * (dk_db_load_for); @name NULL loads every file. Skipped files and names
 * that a user's file takes from another become warnings. Returns 0, or
 * CLI_FAIL after printing the error.
 */
int cli_load_db(dk_db **db, const char *name);

/* The same for @n names (dk_db_load_names): the files of those crystals
 * alone when the files show which they are, else every file. */
int cli_load_db_names(dk_db **db, const char *const *names, int n);

/*
 * Find @name (an id or alias, or a path to a crystal file: containing
 * '/' or ending in .yaml, loaded into @db ahead of everything else) or
 * print an error with the nearest names ("did you mean"); NULL if
 * absent.
 */
const dk_crystal *cli_find_crystal(dk_db *db, const char *name);

/* Print "error: C has no data set 'X'; did you mean 'Y'?" and the list
 * of its sets. Returns CLI_FAIL. */
int cli_unknown_set(const dk_crystal *c, const char *name);

/* Find a data set by name (NULL: the default) or print the known sets. */
const dk_dispersion_set *cli_find_set(const dk_crystal *c, const char *name);

/*
 * An output buffer: commands print into it and only a successful command
 * writes it to stdout, so a failure never leaves half an answer.
 */
typedef struct cli_out {
    FILE *f;
    char *buf;
    size_t len;
} cli_out;

int cli_out_open(cli_out *o);
/* Write the buffer to stdout and release it. Returns 0 or CLI_FAIL. */
int cli_out_commit(cli_out *o);
/* Release without writing. */
void cli_out_discard(cli_out *o);

/* Serialise @obj (pretty) into @o, then release @obj. */
void cli_out_json(cli_out *o, json_object *obj);

/* A double for JSON, rounded to 12 significant digits. */
json_object *cli_json_num(double v);

/* [lo, hi] of @r as a JSON array of two numbers. */
json_object *cli_json_range(const double r[2]);


/* Options every crystal command takes. */
typedef struct cli_common {
    const char *crystal;   /* --crystal */
    const char *set_name;  /* --dispersion; NULL: the default set */
    int all;               /* --all-sets */
    int json, csv;         /* --json, --csv */
} cli_common;

#define CLI_COMMON_OPTIONS                                                   \
    {"crystal", required_argument, NULL, 'c'},                               \
        {"dispersion", required_argument, NULL, 'd'},                        \
        {"all-sets", no_argument, NULL, 'a'},                                \
        {"json", no_argument, NULL, 'j'}, {"csv", no_argument, NULL, 'v'},   \
        {"help", no_argument, NULL, 'h'}

/* Take a common option (getopt code @ch): 1 if it was one, 0 if not,
 * CLI_USAGE (after printing) when --crystal or --dispersion repeats. */
int cli_common_option(int ch, const char *arg, cli_common *cm,
                      const char *const usage[]);

/*
 * After the option loop: no leftover arguments, --crystal given, and
 * --json/--csv and --dispersion/--all-sets not combined (--all-sets is
 * refused when @allow_all is 0). Returns 0 or CLI_USAGE after printing.
 */
int cli_common_finish(const cli_common *cm, int argc, char **argv,
                      int allow_all, const char *const usage[]);


/* The wavelength options every mixing command takes. */
typedef struct cli_wave_args {
    const char *pump, *signal, *idler, *fundamental;
} cli_wave_args;

/*
 * Parse the given wavelengths into @w (missing ones 0). With
 * @need_two, exactly two of pump/signal/idler or --fundamental alone
 * must be given and the third is filled in. *shg is set for
 * --fundamental. Prints the error and returns CLI_USAGE on failure.
 */
int cli_parse_waves(const cli_wave_args *a, int need_two, dk_waves *w,
                    int *shg, const char *const usage[]);

/*
 * Parse "LO:HI" into @r (low < high): temperatures in °C when
 * @wavelengths is 0 ("20:200", "300K:400K"), else wavelengths in µm
 * ("2.8um:4.2um"). Returns 0, or DK_EINVAL with @err filled.
 */
int cli_parse_range(const char *s, int wavelengths, double r[2],
                    dk_error *err);

/* Warn when @c has a caution range that applies at @temp_c. */
void cli_warn_caution(const dk_crystal *c, double temp_c);

#endif /* DK_CLI_H */
