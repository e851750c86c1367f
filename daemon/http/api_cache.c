/* SPDX-License-Identifier: BSD-3-Clause */
/* api_cache.c: the response cache of the computed routes: bounded, least
   recently used out, one computation per key and version. */
#include <pthread.h>
#include <string.h>

#include "core/mem.h"
#include "http/api_cache.h"

enum entry_state {
	ENTRY_EMPTY,		/* no answer kept (a failed or new entry) */
	ENTRY_BUSY,		/* its owner computes the answer */
	ENTRY_READY,		/* the answer of (gen, stamp) */
	ENTRY_UNFIT		/* the answer of (gen, stamp) may not be kept */
};

struct api_cache_entry {
	struct api_cache_entry *prev, *next;	/* most recently used first */
	char *key;				/* owned */
	size_t keylen;
	unsigned long gen;
	double stamp;
	enum entry_state state;
	unsigned waiters;			/* requests waiting on it */
	unsigned status;
	const char *content_type;		/* static storage */
	char *body;				/* owned, len bytes */
	size_t len;
};

struct api_cache {
	pthread_mutex_t mu;
	pthread_cond_t cv;		/* an entry stopped being busy */
	struct api_cache_entry *head, *tail;
	size_t n, max_entries, bytes, max_bytes;
	struct api_cache_stats st;
};

struct api_cache *
api_cache_new(size_t max_entries, size_t max_bytes)
{
	struct api_cache *c = mem_calloc(1, sizeof *c);

	if (c == NULL)
		return NULL;
	if (pthread_mutex_init(&c->mu, NULL) != 0) {
		mem_free(c);
		return NULL;
	}
	if (pthread_cond_init(&c->cv, NULL) != 0) {
		pthread_mutex_destroy(&c->mu);
		mem_free(c);
		return NULL;
	}
	c->max_entries = max_entries > 0 ? max_entries : 1;
	c->max_bytes = max_bytes;
	return c;
}

static void
entry_drop_body(struct api_cache *c, struct api_cache_entry *e)
{
	c->bytes -= e->len;
	mem_free(e->body);
	e->body = NULL;
	e->len = 0;
}

static void
unlink_entry(struct api_cache *c, struct api_cache_entry *e)
{
	if (e->prev != NULL)
		e->prev->next = e->next;
	else
		c->head = e->next;
	if (e->next != NULL)
		e->next->prev = e->prev;
	else
		c->tail = e->prev;
	e->prev = e->next = NULL;
}

static void
push_front(struct api_cache *c, struct api_cache_entry *e)
{
	e->prev = NULL;
	e->next = c->head;
	if (c->head != NULL)
		c->head->prev = e;
	c->head = e;
	if (c->tail == NULL)
		c->tail = e;
}

static void
entry_free(struct api_cache *c, struct api_cache_entry *e)
{
	unlink_entry(c, e);
	entry_drop_body(c, e);
	mem_free(e->key);
	mem_free(e);
	c->n--;
}

void
api_cache_free(struct api_cache *c)
{
	if (c == NULL)
		return;
	while (c->head != NULL)
		entry_free(c, c->head);
	pthread_cond_destroy(&c->cv);
	pthread_mutex_destroy(&c->mu);
	mem_free(c);
}

/* May e go (nobody computes it or waits on it)? */
static int
evictable(const struct api_cache_entry *e)
{
	return e->state != ENTRY_BUSY && e->waiters == 0;
}

/* Drop least recently used entries other than keep until the cache
   holds fewer than `entries` entries and at most `bytes` of bodies;
   0 when that cannot be done. */
static int
make_room(struct api_cache *c, size_t entries, size_t bytes,
    const struct api_cache_entry *keep)
{
	struct api_cache_entry *e = c->tail, *prev;

	while (e != NULL && (c->n >= entries || c->bytes > bytes)) {
		prev = e->prev;
		if (e != keep && evictable(e))
			entry_free(c, e);
		e = prev;
	}
	return c->n < entries && c->bytes <= bytes;
}

static struct api_cache_entry *
find(struct api_cache *c, const char *key, size_t keylen)
{
	for (struct api_cache_entry *e = c->head; e != NULL; e = e->next)
		if (e->keylen == keylen && memcmp(e->key, key, keylen) == 0)
			return e;
	return NULL;
}

/* Is (gen, stamp) newer than the entry's version? */
static int
newer(unsigned long gen, double stamp, const struct api_cache_entry *e)
{
	return gen > e->gen || (gen == e->gen && stamp > e->stamp);
}

static int
same(unsigned long gen, double stamp, const struct api_cache_entry *e)
{
	return gen == e->gen && stamp == e->stamp;
}

/* Copy the kept answer into resp; 0, or -1 when out of memory. */
static int
copy_out(const struct api_cache_entry *e, struct api_response *resp)
{
	mbuf_free(&resp->body);
	mbuf_add(&resp->body, e->body != NULL ? e->body : "", e->len);
	if (mbuf_status(&resp->body) != ERRCODE_OK) {
		api_error(resp, ERRCODE_NOMEM, NULL, NULL);
		return -1;
	}
	resp->status = e->status;
	resp->content_type = e->content_type;
	return 0;
}

/* Make e the owner's entry for (gen, stamp). */
static enum api_cache_way
own_entry(struct api_cache *c, struct api_cache_entry *e, unsigned long gen,
    double stamp, struct api_cache_entry **own)
{
	entry_drop_body(c, e);
	e->gen = gen;
	e->stamp = stamp;
	e->state = ENTRY_BUSY;
	c->st.misses++;
	*own = e;
	return API_CACHE_OWN;
}

enum api_cache_way
api_cache_get(struct api_cache *c, const char *key, size_t keylen,
    unsigned long gen, double stamp, struct api_response *resp,
    struct api_cache_entry **own)
{
	struct api_cache_entry *e;
	enum api_cache_way way = API_CACHE_PASS;
	int waited = 0;

	*own = NULL;
	pthread_mutex_lock(&c->mu);
	for (;;) {
		e = find(c, key, keylen);
		if (e == NULL) {
			if (!make_room(c, c->max_entries, c->max_bytes, NULL))
				break;
			if ((e = mem_calloc(1, sizeof *e)) == NULL ||
			    (e->key = mem_alloc(keylen ? keylen : 1)) == NULL) {
				mem_free(e);
				break;
			}
			memcpy(e->key, key, keylen);
			e->keylen = keylen;
			push_front(c, e);
			c->n++;
			way = own_entry(c, e, gen, stamp, own);
			break;
		}
		if (e->state == ENTRY_BUSY) {
			if (!same(gen, stamp, e) && !newer(gen, stamp, e))
				break;		/* an older request */
			e->waiters++;
			waited = 1;
			while (e->state == ENTRY_BUSY)
				pthread_cond_wait(&c->cv, &c->mu);
			e->waiters--;
			continue;
		}
		if (same(gen, stamp, e) && e->state == ENTRY_READY) {
			unlink_entry(c, e);
			push_front(c, e);
			way = copy_out(e, resp) == 0 ? API_CACHE_HIT :
			    API_CACHE_PASS;
			if (way == API_CACHE_HIT) {
				c->st.hits++;
				c->st.waits += (unsigned long)waited;
				pthread_mutex_unlock(&c->mu);
				return way;
			}
			break;
		}
		if (same(gen, stamp, e) && e->state == ENTRY_UNFIT)
			break;		/* each computes its own */
		if (newer(gen, stamp, e) || e->state == ENTRY_EMPTY)
			way = own_entry(c, e, gen, stamp, own);
		break;
	}
	if (way == API_CACHE_PASS)
		c->st.passes++;
	pthread_mutex_unlock(&c->mu);
	return way;
}

void
api_cache_put(struct api_cache *c, struct api_cache_entry *own,
    const struct api_response *resp)
{
	size_t n = resp->body.len;
	int fit;

	if (own == NULL)
		return;
	pthread_mutex_lock(&c->mu);
	fit = resp->status < 500 && mbuf_status(&resp->body) == ERRCODE_OK &&
	    n <= c->max_bytes / 4;
	/* Keep within the bounds with this body added. */
	if (fit && !make_room(c, c->max_entries + 1, c->max_bytes - n, own))
		fit = 0;
	if (fit && (own->body = mem_alloc(n ? n : 1)) == NULL)
		fit = 0;
	if (fit) {
		if (n > 0)
			memcpy(own->body, resp->body.data, n);
		own->len = n;
		c->bytes += n;
		own->status = resp->status;
		own->content_type = resp->content_type;
		own->state = ENTRY_READY;
	} else {
		/* A failure (5xx) may not last: the next request retries.
		   An answer too big to keep is computed by each request. */
		own->state = resp->status < 500 ? ENTRY_UNFIT : ENTRY_EMPTY;
	}
	pthread_cond_broadcast(&c->cv);
	pthread_mutex_unlock(&c->mu);
}

void
api_cache_stats(struct api_cache *c, struct api_cache_stats *out)
{
	pthread_mutex_lock(&c->mu);
	*out = c->st;
	out->entries = c->n;
	out->bytes = c->bytes;
	pthread_mutex_unlock(&c->mu);
}
