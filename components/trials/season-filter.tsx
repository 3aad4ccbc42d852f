import { SelectField } from "@/components/ui/field";
import { Button } from "@/components/ui/button";

/** Chooses which season's trials the list shows; a plain GET form, so the choice is in the address and works without script. */
export function SeasonFilter({ seasons, selected }: { seasons: { id: number; label: string; closed: boolean }[]; selected?: number }) {
  return (
    <form method="get" action="/portal/trials" className="flex flex-wrap items-end gap-2">
      <SelectField label="Season" name="season" id="season-filter" defaultValue={selected ? String(selected) : ""} className="min-w-56">
        <option value="">Every season</option>
        {seasons.map((s) => (
          <option key={s.id} value={s.id}>
            {s.label}
            {s.closed ? " (closed)" : ""}
          </option>
        ))}
      </SelectField>
      <Button type="submit" variant="secondary">
        Show
      </Button>
    </form>
  );
}
