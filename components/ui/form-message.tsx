/** A form's overall outcome: errors that belong to no single field, or a success note. */
export function FormMessage({ id, errors, success }: { id?: string; errors?: string[]; success?: string }) {
  if (errors?.length) {
    return (
      <div id={id} role="alert" className="flex gap-2 rounded-md border border-sev-critical/30 bg-sev-critical-bg px-3 py-2.5 text-sm text-sev-critical">
        <span aria-hidden="true">⚠</span>
        <p>{errors.join(" ")}</p>
      </div>
    );
  }
  if (success) {
    return (
      <div id={id} role="status" className="flex gap-2 rounded-md border border-ok/30 bg-ok-bg px-3 py-2.5 text-sm text-ok">
        <span aria-hidden="true">✓</span>
        <p>{success}</p>
      </div>
    );
  }
  return null;
}
