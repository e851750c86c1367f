/* SPDX-License-Identifier: BSD-3-Clause */
/* errcode.h: status codes shared by every moonrange module. */
#ifndef MOONRANGE_ERRCODE_H
#define MOONRANGE_ERRCODE_H

/*
 * Every fallible function returns one of these.  ERRCODE_OK is zero so that
 * "if (rc)" reads as "if it failed".  The list ends with a sentinel;
 * errcode_str() and errcode_name() are switches without a default, so a code
 * added here without its message is a compiler warning (an error under
 * -DWERROR=ON).
 */
enum errcode {
	ERRCODE_OK = 0,
	ERRCODE_NOMEM,		/* an allocation failed */
	ERRCODE_BAD_ARG,	/* a value is malformed or out of range */
	ERRCODE_BAD_TIME,	/* a time cannot be parsed or converted */
	ERRCODE_CONFIG,		/* the station file or a setting is wrong */
	ERRCODE_DB,		/* the database refused or failed */
	ERRCODE_NOT_FOUND,	/* a named thing does not exist */
	ERRCODE_IO,		/* a file or socket operation failed */
	ERRCODE_EXISTS,		/* refusing to overwrite something */
	ERRCODE_AUTH,		/* missing or wrong credentials */
	ERRCODE_TOO_LARGE,	/* input over a size limit */
	ERRCODE_UNSUPPORTED,	/* a media type or method not offered */
	ERRCODE_NO_CONVERGE,	/* a root search did not converge */
	ERRCODE_METHOD,		/* a request method a resource does not offer */
	ERRCODE__LAST
};

/* Short human sentence for a code; never NULL, static storage. */
const char *errcode_str(enum errcode code);

/* Stable machine name for a code ("bad_arg"), used in JSON error bodies. */
const char *errcode_name(enum errcode code);

/* 1 when a failure is the program's or its system's (memory, database,
   I/O, a search that did not converge, an unknown code), 0 when it is
   about what the caller gave (and for ERRCODE_OK): the one split behind
   the command line's exit status 1 or 2 and the API's 500 or 4xx. */
int errcode_is_internal(enum errcode code);

#endif
