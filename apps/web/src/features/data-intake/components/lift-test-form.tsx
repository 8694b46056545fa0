import { zodResolver } from "@hookform/resolvers/zod";
import { liftTestInputSchema, type DatasetCell, type LiftTestInput } from "@tributary/contracts";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import { Button } from "../../../components/ui/button";
import { describedBy, Field, inputClass } from "../../../components/ui/field";
import { ApiError } from "../../../lib/api-client";

type LiftTestFormProps = {
  cells: DatasetCell[];
  channels: string[];
  currency: string;
  onSubmit: (input: LiftTestInput) => Promise<unknown>;
};

type FormValues = z.input<typeof liftTestInputSchema>;
const fieldNames = ["brand", "market", "channel", "firstWeek", "lastWeek", "spend", "incrementalOutcome", "standardError", "note"] as const;

export function LiftTestForm({ cells, channels, currency, onSubmit }: LiftTestFormProps) {
  const brands = [...new Set(cells.map((cell) => cell.brand))].sort();
  const form = useForm<FormValues, unknown, LiftTestInput>({
    resolver: zodResolver(liftTestInputSchema),
    defaultValues: { brand: brands[0] ?? "", market: "", channel: channels[0] ?? "", firstWeek: "", lastWeek: "", note: "" },
  });
  const { errors, isSubmitting } = form.formState;
  const brand = form.watch("brand");
  const markets = cells.filter((cell) => cell.brand === brand).map((cell) => cell.market).sort();

  const submit = form.handleSubmit(async (values) => {
    try {
      // An empty note is no note.
      await onSubmit(values.note ? values : { ...values, note: undefined });
      form.reset({ ...form.getValues(), firstWeek: "", lastWeek: "", spend: undefined, incrementalOutcome: undefined, standardError: undefined, note: "" });
    } catch (error) {
      const issues = error instanceof ApiError ? error.issues : [];
      let placed = false;
      for (const issue of issues) {
        const name = fieldNames.find((field) => issue.path === field || issue.path.endsWith(`.${field}`));
        if (name) {
          form.setError(name, { type: "server", message: issue.message });
          placed = true;
        }
      }
      form.setError("root", {
        type: "server",
        message: error instanceof Error ? error.message : placed ? "Check the highlighted fields." : "The lift test could not be saved.",
      });
    }
  });

  const control = (name: (typeof fieldNames)[number]) => ({
    id: `lift-${name}`,
    "aria-invalid": errors[name] ? true : undefined,
    "aria-describedby": describedBy(`lift-${name}`, { error: errors[name] }),
  });

  return (
    <form onSubmit={submit} noValidate aria-label="Add a lift test" className="space-y-4">
      {errors.root ? (
        <p role="alert" className="rounded-md bg-alert-100 px-3 py-2 text-small text-alert-700">
          {errors.root.message}
        </p>
      ) : null}
      <div className="grid gap-4 md:grid-cols-3">
        <Field id="lift-brand" label="Brand" error={errors.brand?.message}>
          <select className={`${inputClass} w-full`} {...control("brand")} {...form.register("brand", { onChange: () => form.setValue("market", "") })}>
            {brands.map((name) => (
              <option key={name}>{name}</option>
            ))}
          </select>
        </Field>
        <Field id="lift-market" label="Market" error={errors.market?.message}>
          <select className={`${inputClass} w-full`} {...control("market")} {...form.register("market")}>
            <option value="">Choose a market</option>
            {markets.map((name) => (
              <option key={name}>{name}</option>
            ))}
          </select>
        </Field>
        <Field id="lift-channel" label="Channel" error={errors.channel?.message}>
          <select className={`${inputClass} w-full`} {...control("channel")} {...form.register("channel")}>
            {channels.map((name) => (
              <option key={name}>{name}</option>
            ))}
          </select>
        </Field>
        <Field id="lift-firstWeek" label="First week (a Monday)" error={errors.firstWeek?.message}>
          <input type="date" className={`${inputClass} w-full`} {...control("firstWeek")} {...form.register("firstWeek")} />
        </Field>
        <Field id="lift-lastWeek" label="Last week (a Monday)" error={errors.lastWeek?.message}>
          <input type="date" className={`${inputClass} w-full`} {...control("lastWeek")} {...form.register("lastWeek")} />
        </Field>
        <Field id="lift-spend" label={`Spend during the test (${currency})`} error={errors.spend?.message}>
          <input type="number" inputMode="decimal" min={0} step="any" className={`${inputClass} w-full`} {...control("spend")} {...form.register("spend", { valueAsNumber: true })} />
        </Field>
        <Field id="lift-incrementalOutcome" label="Measured extra outcome" error={errors.incrementalOutcome?.message} help="e.g. extra new customers the test group brought; may be negative">
          <input
            type="number"
            inputMode="decimal"
            step="any"
            className={`${inputClass} w-full`}
            {...control("incrementalOutcome")}
            {...form.register("incrementalOutcome", { valueAsNumber: true })}
          />
        </Field>
        <Field id="lift-standardError" label="Its standard error" error={errors.standardError?.message} help="From the experiment's analysis; above 0">
          <input
            type="number"
            inputMode="decimal"
            min={0}
            step="any"
            className={`${inputClass} w-full`}
            {...control("standardError")}
            {...form.register("standardError", { valueAsNumber: true })}
          />
        </Field>
        <Field id="lift-note" label="Note (optional)" error={errors.note?.message}>
          <input className={`${inputClass} w-full`} maxLength={500} {...control("note")} {...form.register("note")} />
        </Field>
      </div>
      <Button type="submit" disabled={isSubmitting || cells.length === 0}>
        {isSubmitting ? "Saving…" : "Add lift test"}
      </Button>
    </form>
  );
}
