/* SPDX-License-Identifier: BSD-3-Clause */
/* fuzz_crd.c: the CRD normal-point importer (import_crd), as np import reads it. */
#include <stddef.h>
#include <stdint.h>
#include <string.h>

#include "formats/import.h"
#include "fuzz_common.h"

FUZZ_IMPORTER(import_crd, any_np)
