/* SPDX-License-Identifier: BSD-3-Clause */
/* api_cache.h: the daemon's response cache: whole answers of the
   computed routes, keyed by the normalised query and a version. */
#ifndef MOONRANGE_API_CACHE_H
#define MOONRANGE_API_CACHE_H

#include <stddef.h>

#include "http/api.h"

/*
 * A bounded map from a key (the route and its sorted query parameters,
 * any bytes) to one response: status, content type and body.  Each entry
 * also carries a version, (gen, stamp): the data generation it was
 * computed from and the instant that stood for "now".  A request finds
 * the entry of its key and uses it only when the versions are equal; a
 * newer request replaces it.  So a key holds one entry whatever the
 * number of generations and instants asked for.
 *
 * Identical misses compute once: the first request owns the entry while
 * it computes (API_CACHE_OWN) and the others wait for its answer.  At
 * most max_entries entries and max_bytes of bodies are kept (least
 * recently used first out); a body over max_bytes / 4 is not kept, and
 * then the waiters compute it each on their own (API_CACHE_PASS), as
 * does a request older than the entry's version or one that finds every
 * entry busy.  Answers of status 500 and above are never kept.
 *
 * Thread-safe: one mutex and one condition variable per cache.
 */

struct api_cache;
struct api_cache_entry;

enum api_cache_way {
	API_CACHE_HIT,		/* resp filled from the cache */
	API_CACHE_OWN,		/* compute resp, then api_cache_put */
	API_CACHE_PASS		/* compute resp, do not put it */
};

struct api_cache_stats {
	unsigned long hits;	/* answered from an entry (waits included) */
	unsigned long misses;	/* computed and offered (API_CACHE_OWN) */
	unsigned long waits;	/* waited for another request's answer */
	unsigned long passes;	/* computed without the cache */
	size_t entries, bytes;	/* kept now */
};

/* A cache of at most max_entries entries and max_bytes of bodies; NULL
   when out of memory.  Freed by api_cache_free (accepts NULL). */
struct api_cache *api_cache_new(size_t max_entries, size_t max_bytes);
void api_cache_free(struct api_cache *c);

/*
 * Look key up for the version (gen, stamp).  HIT: resp (initialised by
 * the caller) holds the kept answer.  OWN: *own is the entry to fill; the
 * caller computes resp and must call api_cache_put(c, *own, resp) once,
 * whatever the answer.  PASS: compute resp and do not put it.  May block
 * while another request computes the same key and version.
 */
enum api_cache_way api_cache_get(struct api_cache *c, const char *key,
    size_t keylen, unsigned long gen, double stamp,
    struct api_response *resp, struct api_cache_entry **own);

/* Keep resp (copied) in the entry api_cache_get gave, if it may be
   kept, and wake the requests waiting for it. */
void api_cache_put(struct api_cache *c, struct api_cache_entry *own,
    const struct api_response *resp);

void api_cache_stats(struct api_cache *c, struct api_cache_stats *out);

#endif
