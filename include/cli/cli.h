/* SPDX-License-Identifier: BSD-3-Clause */
/* cli.h: the subcommand table and helpers shared by the cmd_*.c files. */
#ifndef MOONRANGE_CLI_H
#define MOONRANGE_CLI_H

#include <stdarg.h>
#include <stddef.h>
#include <stdio.h>

#include "core/errcode.h"
#include "core/mem.h"

/* Exit statuses of the program. */
#define CLI_EXIT_OK	0
#define CLI_EXIT_FAIL	1	/* runtime failure: database, file, network */
#define CLI_EXIT_USAGE	2	/* bad input: option, value, time, file row */
#define CLI_EXIT_INTERRUPTED 130	/* stopped by SIGINT (128 + 2) */

/*
 * The command table.  Every subcommand is declared once, as a row of
 * cli_commands in daemon/cli/cli_table.c; its options, their value kinds
 * and bounds, its operands and its help text are data, from which the
 * parser (cli_args.c), --help, the manual page and shell completion
 * (cli_help.c) are made.  The run function (daemon/cli/cmd_<name>.c,
 * declared in cli/cmd_run.h) gets the values already parsed and checked.
 */

/* What an option's value is. */
enum cli_kind {
	CLI_FLAG,	/* no value: --json */
	CLI_TEXT,	/* any text; the command checks it */
	CLI_TIME,	/* UTC: "now" or ISO 8601 with Z */
	CLI_REAL,	/* plain decimal (no exponent, hex, inf) in min..max */
	CLI_WHOLE,	/* whole decimal number in min..max */
	CLI_ZONE,	/* an IANA time zone this system knows */
	CLI_DB,		/* a database file: not a directory, not empty */
	CLI_BOOL,	/* yes/no, true/false, on/off, 1/0, any letter case */
	CLI_WORD	/* one of the space-separated .words */
};

/* Flags of an option. */
#define CLI_REQUIRED	0x1	/* must be given */
#define CLI_MANY	0x2	/* may be given more than once */
#define CLI_ABOVE_MIN	0x4	/* CLI_REAL: strictly above min */

struct cli_option {
	const char *name;	/* without "--"; NULL ends a table */
	enum cli_kind kind;
	const char *arg;	/* the value's name in help: FILE, UTC, N */
	double min, max;	/* CLI_REAL, CLI_WHOLE */
	const char *words;	/* CLI_WORD: "debug info warn error" */
	const char *unit;	/* CLI_REAL in errors: "a number of <unit>" */
	int flags;
	int group;		/* 1..15: options of a group exclude each other */
	const char *help;	/* wrapped to 80 columns; '\n' breaks */
};

/* The operand fields of a command taking exactly one operand, named
   what in its usage line: CLI_ONE_OPERAND("ID"). */
#define CLI_ONE_OPERAND(what) .operands = (what), .nmin = 1, .nmax = 1

struct cli_args;
struct cli_store;

/*
 * What a command does on its open --db (cli_store.h), with the ctx given
 * to cli_store_run (what the command checked before opening it, or NULL):
 * write what it prints into out (caller-owned), or return an error code
 * with a sentence in err (an empty err: the code's own text is printed).
 */
typedef enum errcode cli_store_job(struct cli_store *c,
    const struct cli_args *a, void *ctx, struct mbuf *out, char *err,
    size_t errlen);

/* A command's run function: the arguments parsed and checked, it
   returns the exit status having printed its output or one error line. */
typedef int cli_run_fn(const struct cli_args *a);

/* Help a command prints after its options (made at run time). */
typedef void cli_more_fn(FILE *f);

struct cli_command {
	const char *name;
	const char *summary;	/* one line, in the command list */
	const char *about;	/* --help's description; '\n' breaks */
	const struct cli_option *options;	/* NULL-name ended, or NULL */
	const char *operands;	/* in the usage line: "ID", "FILE..." */
	int nmin, nmax;		/* operands allowed (nmax -1: no limit) */
	unsigned one_of;	/* bit g: one option of group g is required */
	cli_run_fn *run;	/* NULL when actions */
	/* Or, instead of run, a job on the database: the table runs it
	   through cli_store_run with db_flags (of store_open) and no ctx. */
	cli_store_job *job;
	int db_flags;
	int mode;	/* a->cmd->mode: which variant of a shared run */
	const struct cli_command *actions;	/* ended by a NULL name */
	cli_more_fn *more;	/* help printed after the options, or NULL */
};

/* The parsed command line of one (sub)command, for its run function. */
#define CLI_MAX_OPTIONS 32

struct cli_value {
	const char *text;	/* as given */
	double real;		/* CLI_REAL; CLI_TIME: the UTC MJD */
	double utc1, utc2;	/* CLI_TIME: two-part quasi-JD */
	long whole;		/* CLI_WHOLE; CLI_BOOL 0/1; CLI_WORD index */
};

struct cli_args {
	const struct cli_command *cmd;
	char path[64];		/* "windows", "log add": for messages */
	int given[CLI_MAX_OPTIONS];	/* times each option was given */
	struct cli_value v[CLI_MAX_OPTIONS];	/* its last value */
	struct { int opt; const char *text; } *seen;	/* every value */
	size_t nseen;
	char **ops;		/* operands, in order */
	int nops;
};

/* The commands, ended by a NULL name (cli_table.c). */
extern const struct cli_command cli_commands[];

/* Dispatch argv (argv[0] the program) to a command; returns exit status. */
int cli_main(int argc, char **argv);

/* Run the command named argv[0] of the table with its arguments (as
   "moonrange argv..."); what demo uses to run init and serve. */
int cli_run(int argc, char **argv);

/* --- a command's view of its parsed arguments (cli_args.c) -------------
 * name is an option of the command's table (without "--"); asking for
 * another is a programming error (assert).  The "or" value is returned
 * when the option was not given. */
int cli_given(const struct cli_args *a, const char *name);
const char *cli_text(const struct cli_args *a, const char *name,
    const char *or);
double cli_real(const struct cli_args *a, const char *name, double or);
long cli_whole(const struct cli_args *a, const char *name, long or);
/* CLI_TIME: 1 and *utc1, *utc2 set when given, else 0. */
int cli_time(const struct cli_args *a, const char *name, double *utc1,
    double *utc2);
/* The i-th value of a CLI_MANY option (i < cli_given), in order. */
const char *cli_nth(const struct cli_args *a, const char *name, int i);

/* Parse argv (argv[0] the command word) for cmd into a.  Returns -1 to
   go on (release a with cli_args_free), or an exit status once it has
   printed help (CLI_EXIT_OK) or one error line (CLI_EXIT_USAGE). */
int cli_args_parse(const struct cli_command *cmd, const char *path,
    int argc, char **argv, struct cli_args *a);
void cli_args_free(struct cli_args *a);

/* The command (or action of parent) named name, else NULL. */
const struct cli_command *cli_find(const struct cli_command *table,
    const char *name);

/* The word of table nearest to s by edit distance, if near enough to be
   a likely typo, else NULL.  words: an array of n strings at stride
   bytes apart (the name field of a table). */
const char *cli_nearest(const char *s, const void *words, size_t n,
    size_t stride);

/* --- help, manual page, completion (cli_help.c) ----------------------- */

/* The help of a command (path "log add") to f, 80 columns. */
void cli_help(FILE *f, const struct cli_command *cmd, const char *path);
/* The program's help: the commands and their summaries. */
void cli_help_main(FILE *f);
/* The manual page moonrange(1) in troff, every command and action with
   its options ('moonrange --man'; the build installs it). */
void cli_man(FILE *f);
/* Shell completion: argv holds the words typed before the one being
   completed (after "moonrange"); prints the candidates, one a line:
   commands, actions, options, an option's words, target ids from --db,
   or "__files__" where a file name goes ('moonrange __complete ...'). */
int cli_complete(int argc, char **argv);
/* Write text from column col (the cursor is there; spaces up to indent
   first), wrapping at spaces before column 80 and indenting continuation
   lines to indent; '\n' in text breaks the line.  Ends with a newline.
   For the "more" help of a command. */
void cli_wrap(FILE *f, const char *text, size_t col, size_t indent);

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

/* A plain decimal ([+-]d[.d], no spaces, exponent or hex) in [min,
   max], through text_parse_real; ERRCODE_BAD_ARG otherwise.  A whole
   number: text_parse_long. */
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
 * The options of a that are parameters of a query, for its param_set
 * (covquery_param_set and its kin): names is the comma-separated list of
 * the parameters as the query spells them ("from,to,min_el", its
 * *_PARAMS), each an option of the command with '_' as '-' (--min-el).
 * From q (zeroed at the start; advanced here) finds the next one given:
 * 1 with its query name in q->name and its value in q->value; 0 when
 * none is left.  Usage:
 *
 *	struct cli_qparam q = {0};
 *
 *	while (cli_query_next(a, WINQUERY_PARAMS, &q))
 *		if (winquery_param_set(&p, q.name, q.value, err, sizeof err))
 *			return cli_usage_error("%s", err);
 */
struct cli_qparam {
	size_t pos;		/* in names, where the search goes on */
	char name[32];		/* the parameter, as the query spells it */
	const char *value;	/* the option's value */
};
int cli_query_next(const struct cli_args *a, const char *names,
    struct cli_qparam *q);

/* Write a buffer to stdout; CLI_EXIT_OK or CLI_EXIT_FAIL. */
int cli_emit(struct mbuf *b);

/* The status of a renderer, then its buffer: a failed renderer prints
   its error (nothing on stdout) and gives CLI_EXIT_FAIL. */
int cli_emit_rendered(enum errcode rc, struct mbuf *b);

/* The end of a command that ran a query into b with status rc: b printed
   (cli_emit) on success; else nothing on stdout, the error line made of
   fmt and the exit status of rc (cli_status_of).  Frees b. */
int cli_finish(enum errcode rc, struct mbuf *b, const char *fmt, ...)
    MEM_PRINTFLIKE(3, 4);

#endif
