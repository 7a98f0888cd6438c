// The fields of a meter (one function and range), for the new and edit forms.
import { Field } from "~/components/Field";
import { SelectField } from "~/components/FormFields";
import { QUANTITIES } from "~/engine/types";

export function MeterFields({ v, e }: { v: Record<string, string | undefined>; e: Record<string, string | undefined> }) {
  return (
    <div className="grid gap-4 sm:grid-cols-2">
      <Field
        className="sm:col-span-2"
        label="Name"
        name="name"
        defaultValue={v.name}
        error={e.name}
        hint="Which meter and which range, e.g. “Van 2 multimeter — AC volts, 600 V”."
      />
      <SelectField label="Measures" name="quantity" defaultValue={v.quantity ?? ""} error={e.quantity}>
        <option value="">Choose…</option>
        {QUANTITIES.map((q) => (
          <option key={q} value={q}>
            {q}
          </option>
        ))}
      </SelectField>
      <Field label="Unit of the range" name="unit" defaultValue={v.unit} error={e.unit} hint="V, A, Ω, µF, °F…" />
      <Field label="Top of the range" name="rangeMax" inputMode="decimal" defaultValue={v.rangeMax} error={e.rangeMax} />
      <Field
        label="Resolution"
        name="resolution"
        inputMode="decimal"
        defaultValue={v.resolution}
        error={e.resolution}
        hint="The smallest step the display shows on this range."
      />
      <Field label="Accuracy: % of reading" name="percent" inputMode="decimal" defaultValue={v.percent} error={e.percent} />
      <Field
        label="Accuracy: counts"
        name="counts"
        inputMode="numeric"
        defaultValue={v.counts}
        error={e.counts}
        hint="± (% of reading + counts × resolution), as the meter's manual states."
      />
    </div>
  );
}
