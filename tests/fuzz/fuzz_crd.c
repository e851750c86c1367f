/* SPDX-License-Identifier: BSD-3-Clause */
/* fuzz_crd.c: the CRD normal-point importer (import_crd), as np import reads it. */
#include <stddef.h>
#include <stdint.h>
#include <string.h>

#include "formats/import.h"
#include "fuzz_common.h"

int
LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
	struct import_report rep;

	import_crd((const char *)data, size, any_np, NULL, &rep);
	check_report(&rep);
	return 0;
}
