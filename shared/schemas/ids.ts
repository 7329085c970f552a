import { z } from "zod";

/**
 * The id of a stored row (a site, zone, bench, batch, user, …). Ids are 32-bit on PostgreSQL: a
 * larger number names no row, and comparing an integer column with it there is an error, not
 * "not found". Refused as input on either database, so both answer alike.
 */
export const MAX_ROW_ID = 2_147_483_647;

export const rowIdSchema = z.number().int().positive().max(MAX_ROW_ID);

/** A row id in a URL path or query string. */
export const rowIdParamSchema = z.coerce.number().int().positive().max(MAX_ROW_ID);
