import type { WindowedQuantity } from "../../../../shared/schemas/quantities.js";
import { isApiError } from "../../../lib/api-client";
import { placeWindowIssues } from "./window-values";

export type WindowFormErrors = { fields: Record<string, string>; form: string | null };

export const NO_WINDOW_ERRORS: WindowFormErrors = { fields: {}, form: null };

/** A failed save mapped onto the window form: the server's field issues by path, the rest as the form's message. */
export function windowErrorsFromApi(error: unknown, sentQuantities: readonly WindowedQuantity[]): WindowFormErrors {
  if (!isApiError(error)) return { fields: {}, form: error instanceof Error ? error.message : "Something went wrong. Try again." };
  if (error.status === 0) return { fields: {}, form: "Benchwarden could not be reached. Check the network and try again." };
  const placed = placeWindowIssues(error.fieldErrors, sentQuantities);
  if (placed.form === null && Object.keys(placed.fields).length === 0) placed.form = error.message;
  return placed;
}
