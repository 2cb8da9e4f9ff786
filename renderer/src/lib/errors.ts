/** A message for people from anything thrown (service errors already carry words and the place). */
export function messageOf(error: unknown): string {
  if (error instanceof Error) return error.message;
  return String(error);
}

/** Where a refused input is, when the services said so (ApiError.where), else null. */
export function whereOf(error: unknown): string | null {
  const where = (error as { where?: unknown } | null)?.where;
  return typeof where === 'string' && where ? where : null;
}
