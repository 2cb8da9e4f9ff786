/** A message for people from anything thrown (service errors already carry words and the place). */
export function messageOf(error: unknown): string {
  if (error instanceof Error) return error.message;
  return String(error);
}
