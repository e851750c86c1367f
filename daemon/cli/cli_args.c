/* SPDX-License-Identifier: BSD-3-Clause */
/* cli_args.c: the one option parser of the command line, driven by the
   command table: values checked by kind and bounds, one error line each. */
#include <assert.h>
#include <math.h>
#include <stdio.h>
#include <string.h>
#include <sys/stat.h>

#include "cli/cli.h"
#include "core/text.h"
#include "core/tscale.h"
#include "formats/render_time.h"
#include "query/qzone.h"

/* Index of option name in cmd's table, or -1. */
static int
opt_index(const struct cli_command *cmd, const char *name, size_t len)
{
	for (int i = 0; cmd->options != NULL && cmd->options[i].name; i++)
		if (strlen(cmd->options[i].name) == len &&
		    strncmp(cmd->options[i].name, name, len) == 0)
			return i;
	return -1;
}

static int
must_index(const struct cli_args *a, const char *name)
{
	int i = opt_index(a->cmd, name, strlen(name));

	assert(i >= 0 && "option not in the command's table");
	return i;
}

int
cli_given(const struct cli_args *a, const char *name)
{
	return a->given[must_index(a, name)];
}

const char *
cli_text(const struct cli_args *a, const char *name, const char *or)
{
	int i = must_index(a, name);

	return a->given[i] ? a->v[i].text : or;
}

double
cli_real(const struct cli_args *a, const char *name, double or)
{
	int i = must_index(a, name);

	return a->given[i] ? a->v[i].real : or;
}

long
cli_whole(const struct cli_args *a, const char *name, long or)
{
	int i = must_index(a, name);

	return a->given[i] ? a->v[i].whole : or;
}

int
cli_time(const struct cli_args *a, const char *name, double *utc1,
    double *utc2)
{
	int i = must_index(a, name);

	if (!a->given[i])
		return 0;
	*utc1 = a->v[i].utc1;
	*utc2 = a->v[i].utc2;
	return 1;
}

const char *
cli_nth(const struct cli_args *a, const char *name, int n)
{
	int i = must_index(a, name);

	for (size_t k = 0; k < a->nseen; k++)
		if (a->seen[k].opt == i && n-- == 0)
			return a->seen[k].text;
	return NULL;
}

/* --- suggestions ---------------------------------------------------------- */

/* Edit distance of two short strings, a swap of neighbours counting as
   one edit (optimal string alignment); longer strings count as far. */
static size_t
distance(const char *s, const char *t)
{
	size_t m = strlen(s), n = strlen(t), d[33][33];

	if (m > 32 || n > 32)
		return 99;
	for (size_t i = 0; i <= m; i++)
		d[i][0] = i;
	for (size_t j = 0; j <= n; j++)
		d[0][j] = j;
	for (size_t i = 1; i <= m; i++)
		for (size_t j = 1; j <= n; j++) {
			size_t v = d[i - 1][j - 1] + (s[i - 1] != t[j - 1]);

			if (d[i - 1][j] + 1 < v)
				v = d[i - 1][j] + 1;
			if (d[i][j - 1] + 1 < v)
				v = d[i][j - 1] + 1;
			if (i > 1 && j > 1 && s[i - 1] == t[j - 2] &&
			    s[i - 2] == t[j - 1] && d[i - 2][j - 2] + 1 < v)
				v = d[i - 2][j - 2] + 1;
			d[i][j] = v;
		}
	return d[m][n];
}

const char *
cli_nearest(const char *s, const void *words, size_t n, size_t stride)
{
	const char *best = NULL;
	size_t bestd = 99, len = strlen(s);

	for (size_t i = 0; i < n; i++) {
		const char *w = *(const char *const *)(const void *)
		    ((const char *)words + i * stride);
		size_t d = distance(s, w);

		if (d < bestd) {
			bestd = d;
			best = w;
		}
	}
	/* A typo: at most a third of the letters wrong, and at most 3. */
	if (best == NULL || bestd == 0 || bestd > 3 || bestd * 3 > len + 1)
		return NULL;
	return best;
}

const struct cli_command *
cli_find(const struct cli_command *table, const char *name)
{
	for (size_t i = 0; table[i].name != NULL; i++)
		if (strcmp(table[i].name, name) == 0)
			return &table[i];
	return NULL;
}

/* --- parsing -------------------------------------------------------------- */

/* "--name ARG" of option o, for messages. */
static void
label(const struct cli_option *o, char *buf, size_t len)
{
	snprintf(buf, len, "--%s%s%s", o->name, o->arg ? " " : "",
	    o->arg ? o->arg : "");
}

/* An unknown "--word": say so, with the nearest option. */
static int
unknown_option(const struct cli_args *a, const char *arg, size_t len)
{
	const struct cli_option *o = a->cmd->options;
	char word[64];
	const char *near = NULL;
	size_t n = 0;

	while (o != NULL && o[n].name != NULL)
		n++;
	if (len < sizeof word) {
		memcpy(word, arg, len);
		word[len] = '\0';
		if (n > 0 && word[1] == '-')
			near = cli_nearest(word + 2, &o[0].name, n, sizeof o[0]);
	}
	if (near != NULL)
		return cli_usage_error("%s: unknown option '%.*s'; did you mean "
		    "--%s? (see 'moonrange %s --help')", a->path, (int)len, arg,
		    near, a->path);
	return cli_usage_error("%s: unknown option '%.*s' (see 'moonrange %s "
	    "--help')", a->path, (int)len, arg, a->path);
}

/* Check and store the value of option i. */
static int
take_value(struct cli_args *a, int i, const char *val)
{
	const struct cli_option *o = &a->cmd->options[i];
	struct cli_value *v = &a->v[i];
	char err[80];
	struct stat sb;
	long w;
	int b;

	v->text = val;
	switch (o->kind) {
	case CLI_FLAG:
	case CLI_TEXT:
		break;
	case CLI_TIME:
		snprintf(err, sizeof err, "--%s", o->name);
		if (cli_parse_time(err, val, &v->utc1, &v->utc2) != ERRCODE_OK)
			return CLI_EXIT_USAGE;
		v->real = (v->utc1 - TEXT_MJD0) + v->utc2;
		break;
	case CLI_REAL:
		if (cli_parse_double(val, o->min, o->max, &v->real) ||
		    ((o->flags & CLI_ABOVE_MIN) && !(v->real > o->min)))
			return cli_usage_error((o->flags & CLI_ABOVE_MIN) ?
			    "--%s: '%s' is not a number%s%s above %g and at "
			    "most %g" : "--%s: '%s' is not a number%s%s in "
			    "%g..%g", o->name, val, o->unit ? " of " : "",
			    o->unit ? o->unit : "", o->min, o->max);
		break;
	case CLI_WHOLE:
		if (text_parse_long(val, (long)o->min, (long)o->max, &w))
			return cli_usage_error("--%s: '%s' is not a whole "
			    "number in %.0f..%.0f", o->name, val, o->min,
			    o->max);
		v->whole = w;
		break;
	case CLI_ZONE:
		if (!qzone_known(val))
			return cli_usage_error("--%s: '%s' is not a time zone "
			    "known to this system (an IANA name such as "
			    "Europe/Madrid)", o->name, val);
		break;
	case CLI_DB:
		/* A missing file is the store's to name (with the remedy). */
		if (stat(val, &sb) == 0 && S_ISDIR(sb.st_mode))
			return cli_usage_error("--%s: '%s' is a directory, not a "
			    "database file", o->name, val);
		if (stat(val, &sb) == 0 && S_ISREG(sb.st_mode) &&
		    sb.st_size == 0)
			return cli_usage_error("--%s: '%s' is an empty file, not "
			    "a moonrange database (create one with 'moonrange "
			    "init --db FILE')", o->name, val);
		break;
	case CLI_BOOL:
		if (text_parse_bool(val, &b))
			return cli_usage_error("--%s: '%s' is not yes or no",
			    o->name, val);
		v->whole = b;
		break;
	case CLI_WORD: {
		const char *p = o->words;
		size_t n = strlen(val);

		for (w = 0; *p; w++) {
			size_t k = strcspn(p, " ");

			if (k == n && n > 0 && strncmp(p, val, n) == 0)
				break;
			p += k;
			p += *p == ' ';
		}
		if (*p == '\0')
			return cli_usage_error("--%s: '%s' is not one of %s",
			    o->name, val, o->words);
		v->whole = w;
		break;
	}
	}
	return -1;
}

/* Options of one group exclude each other. */
static int
check_group(struct cli_args *a, int i)
{
	const struct cli_option *o = a->cmd->options;

	if (o[i].group == 0)
		return -1;
	for (int k = 0; o[k].name != NULL; k++)
		if (k != i && o[k].group == o[i].group && a->given[k])
			return cli_usage_error("--%s and --%s: give one, not "
			    "both", o[k].name, o[i].name);
	return -1;
}

/* One "--name[=value]" at argv[*ip]; may take argv[*ip + 1]. */
static int
take_option(struct cli_args *a, int argc, char **argv, int *ip)
{
	const struct cli_option *opts = a->cmd->options;
	const char *arg = argv[*ip], *eq = strchr(arg, '='), *val;
	size_t len = eq ? (size_t)(eq - arg) : strlen(arg);
	int i = opt_index(a->cmd, arg + 2, len - 2), st;

	if (i < 0) {
		/* A unique prefix, as getopt_long takes (--js for --json). */
		for (int k = 0; opts != NULL && opts[k].name; k++) {
			if (strncmp(opts[k].name, arg + 2, len - 2) != 0)
				continue;
			if (i >= 0)
				return cli_usage_error("%s: option '%.*s' is "
				    "ambiguous: --%s or --%s", a->path,
				    (int)len, arg, opts[i].name, opts[k].name);
			i = k;
		}
		if (i < 0)
			return unknown_option(a, arg, len);
	}
	if (opts[i].kind == CLI_FLAG) {
		if (eq != NULL)
			return cli_usage_error("--%s: takes no value",
			    opts[i].name);
		val = NULL;
	} else if (eq != NULL) {
		val = eq + 1;
	} else if (*ip + 1 < argc) {
		val = argv[++*ip];
	} else {
		return cli_usage_error("--%s: a value is required (%s)",
		    opts[i].name, opts[i].arg ? opts[i].arg : "TEXT");
	}
	if (a->given[i] && !(opts[i].flags & CLI_MANY))
		return cli_usage_error("--%s: given twice (it takes one %s)",
		    opts[i].name, opts[i].kind == CLI_FLAG ? "mention" :
		    "value");
	if ((st = check_group(a, i)) >= 0 || (st = take_value(a, i, val)) >= 0)
		return st;
	a->given[i]++;
	a->seen[a->nseen].opt = i;
	a->seen[a->nseen++].text = val;
	return -1;
}

/* After the words: required options, groups, operand count. */
static int
check_done(struct cli_args *a)
{
	const struct cli_command *c = a->cmd;
	const struct cli_option *o = c->options;
	char l1[64], l2[64];

	if (a->nops > 0 && c->nmax >= 0 && a->nops > c->nmax)
		return cli_usage_error("%s: unexpected argument '%s'", a->path,
		    a->ops[c->nmax]);
	for (int i = 0; o != NULL && o[i].name; i++) {
		if ((o[i].flags & CLI_REQUIRED) && !a->given[i]) {
			label(&o[i], l1, sizeof l1);
			return cli_usage_error("%s: %s is required", a->path,
			    l1);
		}
	}
	for (int g = 1; g < 16; g++) {
		int first = -1, second = -1, any = 0;

		if (!(c->one_of & (1u << g)))
			continue;
		for (int i = 0; o[i].name; i++)
			if (o[i].group == g) {
				any |= a->given[i];
				if (first < 0)
					first = i;
				else if (second < 0)
					second = i;
			}
		if (!any && second >= 0) {
			label(&o[first], l1, sizeof l1);
			label(&o[second], l2, sizeof l2);
			return cli_usage_error("%s: give %s or %s (one of them)",
			    a->path, l1, l2);
		}
	}
	if (a->nops < c->nmin)
		return cli_usage_error("%s: %s %s required", a->path,
		    c->operands, strstr(c->operands, "...") ||
		    strchr(c->operands, ' ') ? "are" : "is");
	return -1;
}

int
cli_args_parse(const struct cli_command *cmd, const char *path, int argc,
    char **argv, struct cli_args *a)
{
	int dashdash = 0, st;

	memset(a, 0, sizeof *a);
	a->cmd = cmd;
	snprintf(a->path, sizeof a->path, "%s", path);
	a->seen = mem_alloc((size_t)argc * sizeof a->seen[0] + 1);
	a->ops = mem_alloc((size_t)argc * sizeof a->ops[0] + 1);
	if (a->seen == NULL || a->ops == NULL) {
		cli_args_free(a);
		return cli_fail("%s", errcode_str(ERRCODE_NOMEM));
	}
	for (int i = 1; i < argc; i++) {
		const char *w = argv[i];

		if (dashdash || w[0] != '-' || w[1] == '\0') {
			a->ops[a->nops++] = argv[i];
			continue;
		}
		if (strcmp(w, "--") == 0) {
			dashdash = 1;
			continue;
		}
		if (strcmp(w, "-h") == 0 || strcmp(w, "--help") == 0) {
			cli_args_free(a);
			cli_help(stdout, cmd, path);
			return CLI_EXIT_OK;
		}
		st = w[1] == '-' ? take_option(a, argc, argv, &i) :
		    unknown_option(a, w, strlen(w));
		if (st >= 0) {
			cli_args_free(a);
			return st;
		}
	}
	if ((st = check_done(a)) >= 0) {
		cli_args_free(a);
		return st;
	}
	return -1;
}

void
cli_args_free(struct cli_args *a)
{
	mem_free(a->seen);
	mem_free(a->ops);
	a->seen = NULL;
	a->ops = NULL;
}
