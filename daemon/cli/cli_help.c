/* SPDX-License-Identifier: BSD-3-Clause */
/* cli_help.c: --help of every command, made from the command table and
   wrapped to 80 columns. */
#include <stdio.h>
#include <string.h>

#include "cli/cli.h"

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
		for (size_t i = 0; c->actions[i] != NULL; i++) {
			snprintf(sub, sizeof sub, "%s %s", path,
			    c->actions[i]->name);
			usage_line(f, i == 0 ? "usage: " : "       ", sub,
			    c->actions[i]);
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
		for (size_t i = 0; c->actions[i] != NULL; i++) {
			fprintf(f, "  %-8s", c->actions[i]->name);
			cli_wrap(f, c->actions[i]->summary, 10, 10);
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
	for (size_t i = 0; cli_commands[i] != NULL; i++) {
		fprintf(f, "  %-10s ", cli_commands[i]->name);
		cli_wrap(f, cli_commands[i]->summary, 13, 13);
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
