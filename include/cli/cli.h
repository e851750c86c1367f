/* SPDX-License-Identifier: BSD-3-Clause */
/* cli.h: the subcommand table and helpers shared by the cmd_*.c files. */
#ifndef MOONRANGE_CLI_H
#define MOONRANGE_CLI_H

#include <stdarg.h>
#include <stddef.h>

#include "core/errcode.h"
#include "core/mem.h"

/* Exit statuses of the program. */
#define CLI_EXIT_OK	0
#define CLI_EXIT_FAIL	1	/* runtime failure: database, file, network */
#define CLI_EXIT_USAGE	2	/* bad input: option, value, time, file row */

struct cli_command {
	const char *name;
	const char *summary;
	int (*run)(int argc, char **argv);	/* argv[0] is the name */
};

/* The table, ended by a NULL name (cli.c). */
extern const struct cli_command cli_commands[];

/* Dispatch argv (argv[0] the program) to a command; returns exit status. */
int cli_main(int argc, char **argv);

/* --- helpers --- */

/* Print "moonrange: error: ..." to stderr; return CLI_EXIT_USAGE. */
int cli_usage_error(const char *fmt, ...) MEM_PRINTFLIKE(1, 2);

/* Print "moonrange: error: ..." to stderr; return CLI_EXIT_FAIL. */
int cli_fail(const char *fmt, ...) MEM_PRINTFLIKE(1, 2);

/* Print "moonrange: KIND: ..." to stderr as one line of UTF-8 text
   (control bytes and malformed UTF-8 shown as '?', at most 512 bytes):
   what the three above print. */
void cli_vmessage(const char *kind, const char *fmt, va_list ap)
    MEM_PRINTFLIKE(2, 0);

/* Print "moonrange: warning: ..." to stderr. */
void cli_warn(const char *fmt, ...) MEM_PRINTFLIKE(1, 2);

/* Exit status for an error code: input errors give CLI_EXIT_USAGE. */
int cli_status_of(enum errcode rc);

/* A whole number or plain decimal ([+-]d[.d], no spaces, exponent or
   hex) in [min, max]; ERRCODE_BAD_ARG otherwise. */
enum errcode cli_parse_double(const char *s, double min, double max,
    double *out);
enum errcode cli_parse_long(const char *s, long min, long max, long *out);

/*
 * "LAT,LON,HEIGHT_M" in degrees (east positive) and metres.  Fills
 * lat/lon in degrees.  errbuf gets a sentence on failure.
 */
enum errcode cli_parse_station(const char *s, double *lat_deg,
    double *lon_deg, double *height_m, char *errbuf, size_t errlen);

/*
 * Split s in place at every ',' into at most max fields.  Returns the
 * number of fields, or -1 when there are more than max or any is empty
 * ("1,,2", "1,2,").
 */
int cli_split_fields(char *s, char **fields, int max);

/* The current UTC as a quasi-JD (the one place the CLI reads the clock). */
void cli_now(double *utc1, double *utc2);

/* A UTC time option: "now" or ISO 8601. */
enum errcode cli_parse_time(const char *opt, const char *s, double *utc1,
    double *utc2);

/*
 * The errors of an option loop, for command cmd (and the action word of a
 * command with actions, or NULL): an option getopt_long refused (pass
 * argv[optind - 1]), and an operand left over.  Both print one line and
 * return CLI_EXIT_USAGE.
 */
int cli_bad_option(const char *cmd, const char *action, const char *opt);
int cli_extra_argument(const char *cmd, const char *action, const char *arg);

/* Write a buffer to stdout; CLI_EXIT_OK or CLI_EXIT_FAIL. */
int cli_emit(struct mbuf *b);

/* The status of a renderer, then its buffer: a failed renderer prints
   its error (nothing on stdout) and gives CLI_EXIT_FAIL. */
int cli_emit_rendered(enum errcode rc, struct mbuf *b);

/* --- commands (one file each: cmd_<name>.c) --- */
int cmd_ephem(int argc, char **argv);
int cmd_phases(int argc, char **argv);
int cmd_serve(int argc, char **argv);
int cmd_demo(int argc, char **argv);
int cmd_coverage(int argc, char **argv);
int cmd_windows(int argc, char **argv);
int cmd_tonight(int argc, char **argv);
int cmd_log(int argc, char **argv);
int cmd_init(int argc, char **argv);
int cmd_np(int argc, char **argv);
int cmd_eop(int argc, char **argv);
int cmd_target(int argc, char **argv);
int cmd_station(int argc, char **argv);
int cmd_blackout(int argc, char **argv);
int cmd_setting(int argc, char **argv);

#endif
