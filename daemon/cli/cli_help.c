/* SPDX-License-Identifier: BSD-3-Clause */
/* cli_help.c: --help of every command (wrapped to 80 columns), the
   manual page and shell completion, all made from the command table. */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "cli/cli.h"
#include "store/store.h"

#define HELP_WIDTH 79		/* last column used */
#define HELP_OPT_COL 24		/* where option help starts at most */

void
cli_wrap(FILE *f, const char *text, size_t col, size_t indent)
{
	const char *p = text;
	int fresh = 0;		/* at a new line, indent not yet written */

	if (col < indent) {
		fprintf(f, "%*s", (int)(indent - col), "");
		col = indent;
	}
	while (*p) {
		size_t w = strcspn(p, " \n");

		if (w > 0) {
			if (!fresh && col > indent && col + 1 + w >
			    HELP_WIDTH) {
				fputc('\n', f);
				fresh = 1;
			}
			if (fresh) {
				fprintf(f, "%*s", (int)indent, "");
				col = indent;
				fresh = 0;
			} else if (col > indent) {
				fputc(' ', f);
				col++;
			}
			fwrite(p, 1, w, f);
			col += w;
			p += w;
		}
		if (*p == '\n') {
			fputc('\n', f);
			fresh = 1;
			p++;
		}
		while (*p == ' ')
			p++;
	}
	if (!fresh)
		fputc('\n', f);
}

/* "--name ARG" */
static size_t
opt_label(const struct cli_option *o, char *buf, size_t len)
{
	int n = snprintf(buf, len, "--%s%s%s", o->name, o->arg ? " " : "",
	    o->arg ? o->arg : "");

	return n < 0 ? 0 : (size_t)n;
}

/*
 * The synopsis of c after its name, as units that are not split across
 * lines, each ended by '\n': "--db FILE", "[--days N]", a group of
 * options that exclude each other "[--json | --csv]" (in parentheses
 * when one is required), a repeatable "[--target X]...", the operands.
 */
static void
synopsis(const struct cli_command *c, char *buf, size_t len)
{
	const struct cli_option *o = c->options;
	size_t n = 0;
	char l[96];

	buf[0] = '\0';
#define PUT(...) do { int k_ = snprintf(buf + n, n < len ? len - n : 0, \
	__VA_ARGS__); if (k_ > 0) n += (size_t)k_; } while (0)
	for (int i = 0; o != NULL && o[i].name; i++) {
		int g = o[i].group, first = 1, req;

		opt_label(&o[i], l, sizeof l);
		if (g == 0) {
			if (o[i].flags & CLI_REQUIRED)
				PUT("%s\n", l);
			else
				PUT("[%s]%s\n", l, (o[i].flags & CLI_MANY) ?
				    "..." : "");
			continue;
		}
		for (int k = 0; k < i; k++)
			first &= o[k].group != g;
		if (!first)
			continue;
		req = (c->one_of >> g) & 1;
		PUT("%s", req ? "(" : "[");
		for (int k = i; o[k].name; k++) {
			if (o[k].group != g)
				continue;
			opt_label(&o[k], l, sizeof l);
			PUT("%s%s", k == i ? "" : " | ", l);
		}
		PUT("%s\n", req ? ")" : "]");
	}
	if (c->operands != NULL)
		PUT("%s%s%s\n", c->nmin > 0 ? "" : "[", c->operands,
		    c->nmin > 0 ? "" : "]");
#undef PUT
}

/* One usage line ("usage: moonrange log add ...") wrapped to 80. */
static void
usage_line(FILE *f, const char *lead, const char *path,
    const struct cli_command *c)
{
	char syn[2048];
	size_t col, indent;

	synopsis(c, syn, sizeof syn);
	col = (size_t)fprintf(f, "%smoonrange %s", lead, path);
	indent = col + 1 > 40 ? 8 : col + 1;
	fputc(' ', f);
	col++;
	for (char *p = syn; *p; ) {
		size_t w = strcspn(p, "\n");

		if (col > indent && col + 1 + w > HELP_WIDTH) {
			fprintf(f, "\n%*s", (int)indent, "");
			col = indent;
		} else if (col != indent) {
			fputc(' ', f);
			col++;
		}
		fwrite(p, 1, w, f);
		col += w;
		p += w + (p[w] == '\n');
	}
	fputc('\n', f);
}

static void
options_help(FILE *f, const struct cli_option *o)
{
	size_t col = 14, n;
	char l[96];

	for (int i = 0; o != NULL && o[i].name; i++) {
		n = opt_label(&o[i], l, sizeof l) + 4;
		if (n > col && n <= HELP_OPT_COL)
			col = n;
	}
	for (int i = 0; o != NULL && o[i].name; i++) {
		n = opt_label(&o[i], l, sizeof l);
		fprintf(f, "  %s", l);
		if (n + 2 + 2 > col)
			fprintf(f, "\n%*s", (int)col, "");
		else
			fprintf(f, "%*s", (int)(col - n - 2), "");
		cli_wrap(f, o[i].help ? o[i].help : "", col, col);
	}
	fprintf(f, "  -h, --help%*s", (int)(col - 12), "");
	cli_wrap(f, "this text", col, col);
}

void
cli_help(FILE *f, const struct cli_command *c, const char *path)
{
	char sub[96];

	if (c->actions != NULL) {
		for (size_t i = 0; c->actions[i].name != NULL; i++) {
			snprintf(sub, sizeof sub, "%s %s", path,
			    c->actions[i].name);
			usage_line(f, i == 0 ? "usage: " : "       ", sub,
			    &c->actions[i]);
		}
	} else {
		usage_line(f, "usage: ", path, c);
	}
	if (c->about != NULL) {
		fputc('\n', f);
		cli_wrap(f, c->about, 0, 0);
	}
	if (c->actions != NULL) {
		fprintf(f, "\nActions:\n");
		for (size_t i = 0; c->actions[i].name != NULL; i++) {
			fprintf(f, "  %-8s", c->actions[i].name);
			cli_wrap(f, c->actions[i].summary, 10, 10);
		}
		fprintf(f, "\nRun 'moonrange %s ACTION --help' for the options "
		    "of an action.\n", path);
	} else {
		fputc('\n', f);
		options_help(f, c->options);
	}
	if (c->more != NULL)
		c->more(f);
}

void
cli_help_main(FILE *f)
{
	fprintf(f,
	    "usage: moonrange COMMAND [OPTIONS]\n"
	    "\n"
	    "Planning aid for lunar laser ranging. Commands:\n");
	for (size_t i = 0; cli_commands[i].name != NULL; i++) {
		fprintf(f, "  %-10s ", cli_commands[i].name);
		cli_wrap(f, cli_commands[i].summary, 13, 13);
	}
	fprintf(f,
	    "\n"
	    "Run 'moonrange COMMAND --help' (or 'moonrange help COMMAND') for\n"
	    "the options of a command.\n"
	    "Times are UTC in ISO 8601, e.g. 2027-03-01T04:00:00Z.\n"
	    "moonrange is a planning aid only: it never replaces the station's\n"
	    "laser-safety programme, aircraft and satellite avoidance or sun\n"
	    "interlocks.\n");
}

/* --- the manual page ------------------------------------------------------ */

/* Text for troff: backslashes and hyphens escaped, a line that would
   start with '.' or '\'' protected; '\n' in the table's text is a break. */
static void
man_text(FILE *f, const char *s)
{
	int bol = 1;

	for (; *s; s++) {
		if (bol && (*s == '.' || *s == '\''))
			fputs("\\&", f);
		bol = 0;
		if (*s == '\\')
			fputs("\\e", f);
		else if (*s == '-')
			fputs("\\-", f);
		else if (*s == '\n') {
			fputs("\n.br\n", f);
			bol = 1;
		} else
			fputc(*s, f);
	}
}

static void
man_command(FILE *f, const struct cli_command *c, const char *path)
{
	char syn[2048];

	synopsis(c, syn, sizeof syn);
	fprintf(f, ".SS \"moonrange %s\"\n", path);
	fputs(".B moonrange ", f);
	man_text(f, path);
	fputc('\n', f);
	for (char *p = syn; *p; ) {
		size_t w = strcspn(p, "\n");

		p[w] = '\0';
		man_text(f, p);
		fputc('\n', f);
		p += w + 1;
	}
	fputs(".PP\n", f);
	man_text(f, c->about ? c->about : c->summary);
	fputc('\n', f);
	for (int i = 0; c->options != NULL && c->options[i].name; i++) {
		const struct cli_option *o = &c->options[i];

		fprintf(f, ".TP\n.B \\-\\-");
		man_text(f, o->name);
		if (o->arg != NULL) {
			fputs(" \\fI", f);
			man_text(f, o->arg);
			fputs("\\fR", f);
		}
		fputc('\n', f);
		man_text(f, o->help ? o->help : "");
		fputc('\n', f);
	}
	if (c->more != NULL) {
		/* Help made at run time (keys, defaults), as printed. */
		char *buf = NULL;
		size_t len = 0;
		FILE *m = open_memstream(&buf, &len);

		if (m != NULL) {
			c->more(m);
			fclose(m);
			fputs(".PP\n.nf\n", f);
			man_text(f, buf[0] == '\n' ? buf + 1 : buf);
			fputs("\n.fi\n", f);
			free(buf);
		}
	}
}

void
cli_man(FILE *f)
{
	char sub[96];

	fprintf(f, ".\\\" Generated by 'moonrange --man' from the command "
	    "table; do not edit.\n");
	fprintf(f, ".TH MOONRANGE 1 \"\" \"moonrange %s\" \"User Commands\"\n",
	    MOONRANGE_VERSION);
	fputs(".SH NAME\nmoonrange \\- planning aid for lunar laser ranging "
	    "stations\n", f);
	fputs(".SH SYNOPSIS\n.B moonrange\n.I command\n[\\fIoptions\\fR]\n"
	    ".br\n.B moonrange help\n.I command\n.SH DESCRIPTION\n", f);
	man_text(f, "moonrange plans lunar laser ranging: the geometry of the "
	    "Moon, the Sun and the reflectors, observing windows ranked by "
	    "expected returns and phase coverage, the station's log, normal "
	    "points and Earth orientation in one SQLite database, a coverage "
	    "audit, and a daemon serving a JSON API and a station page.  "
	    "Times are UTC in ISO 8601 (2027-03-01T04:00:00Z, or now).  "
	    "moonrange is a planning aid only: it never replaces the "
	    "station's laser-safety programme, aircraft and satellite "
	    "avoidance or sun interlocks.");
	fputs("\n.PP\nEvery command takes \\fB\\-h\\fR or \\fB\\-\\-help\\fR. "
	    "An option's value follows it (\\fB\\-\\-days 3\\fR) or an equals "
	    "sign (\\fB\\-\\-days=3\\fR); an option that takes one value may "
	    "be given once.\n.SH COMMANDS\n", f);
	for (size_t i = 0; cli_commands[i].name != NULL; i++) {
		const struct cli_command *c = &cli_commands[i];

		if (c->actions == NULL) {
			man_command(f, c, c->name);
			continue;
		}
		for (size_t k = 0; c->actions[k].name != NULL; k++) {
			snprintf(sub, sizeof sub, "%s %s", c->name,
			    c->actions[k].name);
			man_command(f, &c->actions[k], sub);
		}
	}
	fputs(".SH EXIT STATUS\n0 on success, 2 for bad input (an option, a "
	    "value, a row of a file, a missing file), 1 when the database or "
	    "the system fails, 130 when an import was interrupted (nothing of "
	    "it is stored).\n", f);
	fputs(".SH DIAGNOSTICS\nErrors are one line on standard error, "
	    "\\fBmoonrange: error:\\fR followed by the option, or the file, "
	    "line and field, at fault.\n", f);
	fputs(".SH FILES\n.TP\n.I station.ini, targets.csv, attempts.csv, "
	    "*.crd, eop.finals\nthe site directory read by \\fBmoonrange "
	    "init\\fR (see the README).\n", f);
}

/* --- shell completion ------------------------------------------------------ */

/* Print the ids of the active targets of database db, one a line;
   nothing (and no message: this is a command line being typed) when it
   cannot be read. */
static void
complete_targets(const char *db)
{
	struct store *s = NULL;
	struct site_target *t = NULL;
	size_t n = 0;

	if (db == NULL || store_open(db, STORE_OPEN_READONLY, &s, NULL, 0) !=
	    ERRCODE_OK)
		return;
	if (store_targets_list(s, 1, &t, &n, NULL, 0) == ERRCODE_OK)
		for (size_t i = 0; i < n; i++)
			printf("%s\n", t[i].id);
	mem_free(t);
	store_close(s);
}

int
cli_complete(int argc, char **argv)
{
	const struct cli_command *table = cli_commands;
	const struct cli_command *c = NULL;
	const struct cli_option *o;
	const char *db = NULL;
	int i = 0;

	/* The command, then its action. */
	if (argc == 0) {
		for (size_t k = 0; table[k].name != NULL; k++)
			printf("%s\n", table[k].name);
		printf("help\n");
		return CLI_EXIT_OK;
	}
	if (strcmp(argv[0], "help") == 0) {
		c = argc >= 2 ? cli_find(table, argv[1]) : NULL;
		if (argc == 1)
			for (size_t k = 0; table[k].name != NULL; k++)
				printf("%s\n", table[k].name);
		else if (argc == 2 && c != NULL && c->actions != NULL)
			for (size_t k = 0; c->actions[k].name != NULL; k++)
				printf("%s\n", c->actions[k].name);
		return CLI_EXIT_OK;
	}
	if ((c = cli_find(table, argv[0])) == NULL)
		return CLI_EXIT_OK;
	i = 1;
	if (c->actions != NULL) {
		if (argc == 1) {
			for (size_t k = 0; c->actions[k].name != NULL; k++)
				printf("%s\n", c->actions[k].name);
			return CLI_EXIT_OK;
		}
		if ((c = cli_find(c->actions, argv[1])) == NULL)
			return CLI_EXIT_OK;
		i = 2;
	}
	o = c->options;
	for (int k = i; k < argc; k++) {
		if (strcmp(argv[k], "--db") == 0 && k + 1 < argc)
			db = argv[k + 1];
		else if (strncmp(argv[k], "--db=", 5) == 0)
			db = argv[k] + 5;
	}
	/* The value of the option just typed. */
	if (argc > i && strncmp(argv[argc - 1], "--", 2) == 0) {
		const char *name = argv[argc - 1] + 2;

		for (int k = 0; o != NULL && o[k].name; k++) {
			if (strcmp(o[k].name, name) != 0 ||
			    o[k].kind == CLI_FLAG)
				continue;
			if (o[k].kind == CLI_WORD)
				for (const char *p = o[k].words; *p; ) {
					size_t w = strcspn(p, " ");

					printf("%.*s\n", (int)w, p);
					p += w + (p[w] == ' ');
				}
			else if (o[k].kind == CLI_BOOL)
				printf("yes\nno\n");
			else if (strcmp(o[k].name, "target") == 0)
				complete_targets(db);
			else if (o[k].kind == CLI_DB || (o[k].arg != NULL &&
			    (strstr(o[k].arg, "FILE") || strstr(o[k].arg,
			    "DIR"))))
				printf("__files__\n");
			else if (o[k].kind == CLI_TIME)
				printf("now\n");
			return CLI_EXIT_OK;
		}
	}
	/* Options, and the target ids where an ID is the operand. */
	for (int k = 0; o != NULL && o[k].name; k++)
		printf("--%s\n", o[k].name);
	printf("--help\n");
	if (c->operands != NULL && strcmp(c->operands, "ID") == 0 &&
	    c->run != NULL && strstr(argv[0], "target") != NULL)
		complete_targets(db);
	else if (c->operands != NULL && (strstr(c->operands, "FILE") ||
	    strstr(c->operands, ".csv")))
		printf("__files__\n");
	return CLI_EXIT_OK;
}
