/* SPDX-License-Identifier: BSD-3-Clause */
/* render_json.h: what the JSON renderers of formats/ share (numbers, ISO
   times, the dump into an mbuf) and jansson's allocator. */
#ifndef MOONRANGE_RENDER_JSON_H
#define MOONRANGE_RENDER_JSON_H

#include "core/errcode.h"
#include "core/mem.h"

struct json_t;

/* A real rounded to decimals, so the JSON reads cleanly; null when not
   finite.  A new reference (NULL when out of memory). */
struct json_t *render_json_num(double v, int decimals);

/* The one ISO-or-null helper: ISO 8601 UTC text with ndp decimals of
   the seconds of a two-part UTC JD, or null when it is not finite or
   cannot be formatted.  A new reference. */
struct json_t *render_json_utc(double utc1, double utc2, int ndp);

/* The same of a UTC MJD. */
struct json_t *render_json_mjd(double mjd, int ndp);

/* o as built, or NULL (o's reference dropped) when bad says a member
   could not be set: the end of every JSON builder that collects its
   failures in one flag.  NULL stays NULL. */
struct json_t *render_json_checked(struct json_t *o, int bad);

/* Set key on o to the array of item(rec) for each of the n records of
   size bytes at recs (item gives a new reference, NULL when out of
   memory): 0, or non-zero when the array could not be built. */
int render_json_list(struct json_t *o, const char *key, const void *recs,
    size_t n, size_t size, struct json_t *(*item)(const void *rec));

/*
 * Dump root (consumed: its reference is dropped) with a newline into
 * out.  Serialises straight into the mbuf, not with json_dumps: with
 * jansson 2.14, json_dumps was seen to return a document with an object
 * key missing when an allocation inside it failed (test_render's fault
 * loop), i.e. a wrong document reported as success.  The mbuf's failure
 * flag is sticky, so any failed append is seen at the end; a partial
 * document is dropped.  A NULL root (render_json_checked's failure) is
 * ERRCODE_NOMEM.  ERRCODE_OK or ERRCODE_NOMEM.
 */
enum errcode render_json_dump(struct json_t *root, struct mbuf *out);

/* Route jansson's allocations through mem_alloc/mem_free.  Call once at
   start, before any JSON value exists. */
void render_json_setup(void);

#endif
