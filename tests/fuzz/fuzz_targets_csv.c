/* SPDX-License-Identifier: BSD-3-Clause */
/* fuzz_targets_csv.c: the targets CSV (import_targets_csv), as target import reads it. */
#include <stddef.h>
#include <stdint.h>
#include <string.h>

#include "formats/import.h"
#include "fuzz_common.h"

FUZZ_IMPORTER(import_targets_csv, any_target)
