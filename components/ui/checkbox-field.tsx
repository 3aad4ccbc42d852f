/** A labelled checkbox; sends "on" when ticked, which the shared zod `checkbox` reads as true. */
export function CheckboxField({ label, name, defaultChecked, hint, id }: { label: string; name: string; defaultChecked?: boolean; hint?: string; id?: string }) {
  const fieldId = id ?? name;
  return (
    <div className="flex items-start gap-2">
      <input id={fieldId} name={name} type="checkbox" defaultChecked={defaultChecked} className="mt-1 size-5 accent-sprout-600" aria-describedby={hint ? `${fieldId}-hint` : undefined} />
      <label htmlFor={fieldId} className="text-sm">
        <span className="font-semibold">{label}</span>
        {hint && (
          <span id={`${fieldId}-hint`} className="block text-loam-700">
            {hint}
          </span>
        )}
      </label>
    </div>
  );
}
