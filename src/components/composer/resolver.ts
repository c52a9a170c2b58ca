/**
 * A react-hook-form resolver over a zod schema for flat forms (one level of field names). The
 * composer uses this instead of @hookform/resolvers to stay inside its JavaScript budget; the
 * schema is the shared one (`valuesSchemaFor`), so the form and the API check the same rules.
 */
import type { FieldErrors, Resolver } from 'react-hook-form';
import type { z } from 'zod';

export function flatZodResolver<T extends Record<string, unknown>>(schema: z.ZodType): Resolver<T> {
  return async (values) => {
    const r = schema.safeParse(values);
    if (r.success) return { values: values as T, errors: {} };
    const errors: Record<string, { type: string; message: string }> = {};
    for (const issue of r.error.issues) {
      const key = issue.path.join('.') || 'root';
      errors[key] ??= { type: issue.code, message: issue.message };
    }
    return { values: {}, errors: errors as FieldErrors<T> };
  };
}
