/** Join class names, dropping empty and false values. */
export function cx(...classNames: readonly (string | false | null | undefined)[]): string {
  return classNames.filter(Boolean).join(" ");
}
