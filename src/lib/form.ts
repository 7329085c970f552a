import { useCallback, useState } from "react";
import type { z } from "zod";
import { isApiError } from "./api-client";

/** Messages to show on a form: one per field (by the schema's path) and one for the whole form. */
export type FormErrors = { fields: Record<string, string>; form: string | null };

const NO_ERRORS: FormErrors = { fields: {}, form: null };

type FormErrorOptions = {
  /** The form's field names; issues on other paths are shown as the form's message. */
  fields: readonly string[];
  /** Error codes that belong to one field although the server sent no field path (e.g. email-taken → email). */
  codeToField?: Record<string, string>;
};

function collect(issues: readonly { path: string; message: string }[], fields: readonly string[]): FormErrors {
  const result: FormErrors = { fields: {}, form: null };
  for (const issue of issues) {
    if (fields.includes(issue.path)) {
      result.fields[issue.path] ??= issue.message;
    } else {
      result.form ??= issue.message;
    }
  }
  return result;
}

/** The shared schema's issues, keyed by field. */
export function errorsFromZod(error: z.ZodError, fields: readonly string[]): FormErrors {
  return collect(
    error.issues.map((i) => ({ path: i.path.map(String).join("."), message: i.message })),
    fields,
  );
}

/** A failed request's problem details mapped onto the form: `errors[]` by path, the rest as the form's message. */
export function errorsFromApi(error: unknown, { fields, codeToField = {} }: FormErrorOptions): FormErrors {
  if (!isApiError(error)) {
    return { fields: {}, form: error instanceof Error ? error.message : "Something went wrong. Try again." };
  }
  const field = codeToField[error.code];
  if (field) return { fields: { [field]: error.message }, form: null };
  if (error.status === 0) return { fields: {}, form: "Benchwarden could not be reached. Check the network and try again." };
  const result = collect(error.fieldErrors, fields);
  // With every issue placed on its field, the generic "Some fields are not valid" adds nothing.
  if (result.form === null && Object.keys(result.fields).length === 0) result.form = error.message;
  return result;
}

/** Moves focus to the first field marked invalid, so keyboard and screen-reader users land on it. */
export function focusFirstInvalid(form: HTMLFormElement | null) {
  window.setTimeout(() => form?.querySelector<HTMLElement>("[aria-invalid='true']")?.focus(), 0);
}

/**
 * Validation with the same zod schema the server uses, plus the server's own answer mapped onto
 * the same fields. `validate` returns the parsed (trimmed, lower-cased …) value or null.
 */
export function useFormErrors(options: FormErrorOptions) {
  const [errors, setErrors] = useState<FormErrors>(NO_ERRORS);
  const { fields, codeToField } = options;

  const validate = useCallback(
    <S extends z.ZodType>(schema: S, values: unknown, form?: HTMLFormElement | null): z.output<S> | null => {
      const parsed = schema.safeParse(values);
      if (parsed.success) {
        setErrors(NO_ERRORS);
        return parsed.data;
      }
      setErrors(errorsFromZod(parsed.error, fields));
      if (form) focusFirstInvalid(form);
      return null;
    },
    [fields],
  );

  const showServerError = useCallback(
    (error: unknown, form?: HTMLFormElement | null) => {
      setErrors(errorsFromApi(error, { fields, codeToField }));
      if (form) focusFirstInvalid(form);
    },
    [fields, codeToField],
  );

  const clearField = useCallback((name: string) => {
    setErrors((current) => {
      if (!(name in current.fields)) return current;
      const { [name]: _removed, ...rest } = current.fields;
      return { ...current, fields: rest };
    });
  }, []);

  const reset = useCallback(() => setErrors(NO_ERRORS), []);

  return { errors, validate, showServerError, clearField, reset };
}
