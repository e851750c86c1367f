/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_init.c: "moonrange init", a new database loaded from a site
   directory, all or nothing. */
#include <dirent.h>
#include <errno.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include "cli/cli.h"
#include "cli/cmd_run.h"
#include "cli/cli_store.h"

/*
 * Where the sample site is looked for when --site is not given: the
 * installed copy, then the source tree the program was built from (so a
 * build in a clean checkout works without installing).  Both are set by
 * CMakeLists.txt.
 */
#ifndef MOONRANGE_SITE_INSTALLED
#define MOONRANGE_SITE_INSTALLED "/usr/local/share/moonrange/sample-site"
#endif
#ifndef MOONRANGE_SITE_SOURCE
#define MOONRANGE_SITE_SOURCE "sample-site"
#endif

#define INIT_MAX_CRD 64

/* Where the default site is looked for, for --help. */
void
cmd_init_more(FILE *f)
{
	fprintf(f, "\nWithout --site the sample site is loaded from\n  %s\nor, "
	    "in a build tree, from\n  %s\n", MOONRANGE_SITE_INSTALLED,
	    MOONRANGE_SITE_SOURCE);
}

static int
is_dir(const char *p)
{
	struct stat sb;

	return stat(p, &sb) == 0 && S_ISDIR(sb.st_mode);
}

static int
is_file(const char *p)
{
	struct stat sb;

	return stat(p, &sb) == 0 && S_ISREG(sb.st_mode);
}

/* The directory the database goes into must exist (init makes the file,
   not its directories). */
static int
parent_exists(const char *db)
{
	char dir[4096];
	const char *slash = strrchr(db, '/');
	size_t n;

	if (slash == NULL)
		return CLI_EXIT_OK;
	n = slash == db ? 1 : (size_t)(slash - db);
	if (n >= sizeof dir)
		return cli_usage_error("--db: path too long");
	memcpy(dir, db, n);
	dir[n] = '\0';
	if (!is_dir(dir))
		return cli_usage_error("--db: the directory '%s' does not exist "
		    "(create it first)", dir);
	return CLI_EXIT_OK;
}

static int
cmp_names(const void *a, const void *b)
{
	return strcmp(*(char *const *)a, *(char *const *)b);
}

/* The *.crd files of dir, sorted, as new strings in names[]. */
static int
list_crd(const char *dir, char **names, size_t cap, size_t *n)
{
	DIR *d = opendir(dir);
	struct dirent *e;

	*n = 0;
	if (d == NULL)
		return cli_fail("%s: cannot read the directory: %s", dir,
		    strerror(errno));
	while ((e = readdir(d)) != NULL) {
		size_t len = strlen(e->d_name);

		if (len < 5 || strcmp(e->d_name + len - 4, ".crd") != 0)
			continue;
		if (*n == cap) {
			closedir(d);
			return cli_usage_error("%s: more than %zu .crd files",
			    dir, cap);
		}
		if ((names[*n] = mem_strdup(e->d_name)) == NULL) {
			closedir(d);
			return cli_fail("out of memory");
		}
		(*n)++;
	}
	closedir(d);
	qsort(names, *n, sizeof names[0], cmp_names);
	return CLI_EXIT_OK;
}

/* Read a site file into a new buffer; CLI status. */
static int
read_site_file(const char *path, char **buf, size_t *len)
{
	char err[512];
	enum errcode rc;

	rc = cli_store_read_file(path, CLI_STORE_MAX_FILE, buf, len, err,
	    sizeof err);
	if (rc == ERRCODE_OK)
		return CLI_EXIT_OK;
	return cli_store_fail(rc, "%s", err);
}

/*
 * Load every file of the site into c inside one transaction; print a
 * summary to stdout when it all went in.
 */
static int
load_site(struct cli_store *c, const char *dir, const char *name)
{
	char path[4096], *buf = NULL, *crd[INIT_MAX_CRD];
	size_t len = 0, ncrd = 0, nps = 0, npp = 0;
	struct cli_store_counts tn, an, en, nn;
	int st, c04 = 0;

	memset(&tn, 0, sizeof tn);
	an = en = tn;
	if ((st = cli_store_begin(c)) != CLI_EXIT_OK)
		return st;
	snprintf(path, sizeof path, "%s/station.ini", dir);
	if ((st = read_site_file(path, &buf, &len)) ||
	    (st = cli_store_import_station(c, path, buf, len)) ||
	    (st = cli_store_check_zone(&c->station, path)))
		goto out;
	mem_free(buf);
	buf = NULL;
	snprintf(path, sizeof path, "%s/targets.csv", dir);
	if ((st = read_site_file(path, &buf, &len)) ||
	    (st = cli_store_import_targets(c, path, buf, len, &tn)))
		goto out;
	mem_free(buf);
	buf = NULL;
	snprintf(path, sizeof path, "%s/eop.finals", dir);
	if (!is_file(path)) {
		snprintf(path, sizeof path, "%s/eop.c04", dir);
		c04 = 1;
	}
	if (is_file(path)) {
		if ((st = read_site_file(path, &buf, &len)) ||
		    (st = cli_store_import_eop(c, path, buf, len, c04, &en)))
			goto out;
		mem_free(buf);
		buf = NULL;
	}
	snprintf(path, sizeof path, "%s/attempts.csv", dir);
	if (is_file(path)) {
		if ((st = read_site_file(path, &buf, &len)) ||
		    (st = cli_store_import_attempts(c, path, buf, len, &an)))
			goto out;
		mem_free(buf);
		buf = NULL;
	}
	if ((st = list_crd(dir, crd, INIT_MAX_CRD, &ncrd)))
		goto out;
	for (size_t i = 0; i < ncrd; i++) {
		snprintf(path, sizeof path, "%s/%s", dir, crd[i]);
		if ((st = read_site_file(path, &buf, &len)) ||
		    (st = cli_store_import_crd(c, path, buf, len, 1, &nn)))
			goto out;
		nps += nn.added;
		npp += nn.present;
		mem_free(buf);
		buf = NULL;
	}
out:
	st = cli_store_end(c, st, name, "nothing was stored (no database "
	    "was made)");
	if (st == CLI_EXIT_OK)
		printf("%s: station %s (%s), %zu targets, %zu EOP days, %zu "
		    "attempts, %zu normal points from %zu CRD file%s (%zu "
		    "repeated)\n", name, c->station.code, c->station.name,
		    tn.added, en.added, an.added, nps, ncrd, ncrd == 1 ? "" :
		    "s", npp);
	for (size_t i = 0; i < ncrd; i++)
		mem_free(crd[i]);
	mem_free(buf);
	return st;
}

/* Remove a database's WAL companions (and with all = 1 the file). */
static void
remove_db(const char *path, int all)
{
	char p[4300];

	if (all)
		(void)unlink(path);
	snprintf(p, sizeof p, "%s-wal", path);
	(void)unlink(p);
	snprintf(p, sizeof p, "%s-shm", path);
	(void)unlink(p);
}

int
cmd_init(const struct cli_args *a)
{
	const char *db = cli_text(a, "db", NULL), *site = cli_text(a, "site",
	    NULL);
	char tmp[4200];
	struct cli_store c;
	int force = cli_given(a, "force"), st;

	if (strlen(db) > 4000)
		return cli_usage_error("--db: path too long");
	if (site == NULL)
		site = is_dir(MOONRANGE_SITE_INSTALLED) ?
		    MOONRANGE_SITE_INSTALLED : MOONRANGE_SITE_SOURCE;
	if (!is_dir(site))
		return cli_usage_error("--site: '%s' is not a directory", site);
	if (is_dir(db))
		return cli_usage_error("--db: '%s' is a directory, not a "
		    "database file", db);
	if ((st = parent_exists(db)) != CLI_EXIT_OK)
		return st;
	if (access(db, F_OK) == 0 && !force)
		return cli_usage_error("--db: '%s' already exists (use --force "
		    "to replace it)", db);
	/* Build beside the target and rename it into place when complete,
	   so a failure leaves any old database untouched. */
	snprintf(tmp, sizeof tmp, "%s.init-%ld", db, (long)getpid());
	remove_db(tmp, 1);
	if ((st = cli_store_open(&c, tmp, STORE_OPEN_CREATE)) != CLI_EXIT_OK)
		return st;
	st = load_site(&c, site, db);
	cli_store_close(&c);
	if (st == CLI_EXIT_OK) {
		/* An old WAL must not meet the new file. */
		remove_db(db, 0);
		if (rename(tmp, db) != 0)
			st = cli_fail("--db: cannot rename '%s' to '%s': %s",
			    tmp, db, strerror(errno));
	}
	remove_db(tmp, 1);
	return st;
}
