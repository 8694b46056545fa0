import { zodResolver } from "@hookform/resolvers/zod";
import { portfolioSettingsBounds, type PortfolioSettings } from "@tributary/contracts";
import { useEffect, useRef, useState } from "react";
import { useFieldArray, useForm } from "react-hook-form";
import type { z } from "zod";
import { Button } from "../../../components/ui/button";
import { ApiError } from "../../../lib/api-client";
import { channelSettingsInput, useUpdateChannelSettings } from "../api/update-channel-settings";
import { DisplayNameInput } from "./display-name-input";
import { FormActions, SaveFeedback } from "./save-feedback";

type ChannelsForm = z.input<typeof channelSettingsInput>;

const valuesOf = (settings: PortfolioSettings): ChannelsForm => ({ channels: settings.channels.map((channel) => ({ id: channel.id, name: channel.name })) });

/** The channels' display names and order (their codes, used in data files, never change). */
export function ChannelsForm({ settings }: { settings: PortfolioSettings }) {
  const form = useForm<ChannelsForm, unknown, z.output<typeof channelSettingsInput>>({ resolver: zodResolver(channelSettingsInput), defaultValues: valuesOf(settings) });
  const { fields, move } = useFieldArray({ control: form.control, name: "channels", keyName: "key" });
  const update = useUpdateChannelSettings();
  const [done, setDone] = useState<string | null>(null);
  const [moved, setMoved] = useState<{ id: string; direction: "up" | "down" } | null>(null);
  const [announcement, setAnnouncement] = useState("");
  const table = useRef<HTMLTableElement>(null);
  const { errors, isDirty } = form.formState;
  const codeOf = new Map(settings.channels.map((channel) => [channel.id, channel.code] as const));
  const names = form.watch("channels");

  // Keyboard use: after a move the focus stays on the same button of the moved channel (or its other button at an end).
  useEffect(() => {
    if (!moved) return;
    const other = moved.direction === "up" ? "down" : "up";
    const button = (direction: string) => table.current?.querySelector<HTMLButtonElement>(`button[data-move="${moved.id}:${direction}"]`) ?? null;
    const target = button(moved.direction);
    (target && !target.disabled ? target : button(other))?.focus();
  }, [moved, fields]);

  const moveChannel = (from: number, to: number) => {
    const field = fields[from];
    if (!field || to < 0 || to >= fields.length) return;
    move(from, to);
    setDone(null);
    setMoved({ id: field.id, direction: to < from ? "up" : "down" });
    setAnnouncement(`${names[from]?.name ?? "Channel"} moved to position ${to + 1} of ${fields.length}.`);
  };

  // A new edit makes the last "Saved" message stale.
  useEffect(() => {
    if (isDirty) setDone(null);
  }, [isDirty]);

  const submit = form.handleSubmit((values) => {
    setDone(null);
    update.mutate(values, {
      onSuccess: (next) => {
        form.reset(valuesOf(next));
        setDone("Saved. Every screen now shows these names in this order.");
      },
      onError: (error) => {
        if (!(error instanceof ApiError)) return;
        for (const issue of error.issues) {
          const match = /^channels\.(\d+)\.name$/.exec(issue.path);
          if (match) form.setError(`channels.${Number(match[1])}.name`, { type: "server", message: issue.message });
        }
      },
    });
  });

  return (
    <form onSubmit={submit} noValidate aria-labelledby="channels-title" className="space-y-4 rounded-lg border border-line bg-surface p-5 shadow-card">
      <div>
        <h2 id="channels-title" className="text-heading font-semibold text-ink-900">
          Channels
        </h2>
        <p className="max-w-3xl text-small text-ink-700">
          The names every screen, export and e-mail shows, and the order channels are listed in. The code is how data files name the channel; it stays the
          same.
        </p>
      </div>
      {fields.length === 0 ? (
        <p className="text-small text-ink-700">No channels yet: they are created when data is saved in Data intake.</p>
      ) : (
        <table ref={table} className="w-full max-w-3xl text-small">
          <caption className="sr-only">Channel names in display order</caption>
          <thead>
            <tr className="border-b border-line text-left text-caption uppercase tracking-wide text-ink-600">
              <th scope="col" className="w-12 py-2 pr-3 font-semibold">
                Order
              </th>
              <th scope="col" className="py-2 pr-4 font-semibold">
                Display name
              </th>
              <th scope="col" className="py-2 pr-4 font-semibold">
                Code
              </th>
              <th scope="col" className="py-2 font-semibold">
                <span className="sr-only">Move</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {fields.map((field, k) => {
              const error = errors.channels?.[k]?.name;
              const inputId = `channel-name-${field.id}`;
              const code = codeOf.get(field.id) ?? "";
              const label = names[k]?.name?.trim() || code;
              return (
                <tr key={field.key} className="border-b border-line/70 align-middle">
                  <td className="py-2 pr-3 tabular-nums text-ink-600">{k + 1}</td>
                  <td className="py-2 pr-4">
                    <DisplayNameInput
                      inputId={inputId}
                      code={code}
                      maxLength={portfolioSettingsBounds.channelName.max}
                      widthClass="w-64"
                      error={error?.message}
                      registration={form.register(`channels.${k}.name`)}
                    />
                  </td>
                  <td className="py-2 pr-4 font-mono text-caption text-ink-700">{code}</td>
                  <td className="py-1.5">
                    <div className="flex gap-1">
                      <Button
                        variant="secondary"
                        className="px-2.5 py-1"
                        aria-label={`Move ${label} up`}
                        disabled={k === 0 || update.isPending}
                        data-move={`${field.id}:up`}
                        onClick={() => moveChannel(k, k - 1)}
                      >
                        <span aria-hidden="true">↑</span> Up
                      </Button>
                      <Button
                        variant="secondary"
                        className="px-2.5 py-1"
                        aria-label={`Move ${label} down`}
                        disabled={k === fields.length - 1 || update.isPending}
                        data-move={`${field.id}:down`}
                        onClick={() => moveChannel(k, k + 1)}
                      >
                        <span aria-hidden="true">↓</span> Down
                      </Button>
                    </div>
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      )}
      <p className="sr-only" aria-live="polite">
        {announcement}
      </p>
      <FormActions
        saveLabel="Save channels"
        pending={update.isPending}
        dirty={isDirty}
        onUndo={() => {
          form.reset(valuesOf(settings));
          setDone(null);
          update.reset();
          setAnnouncement("");
        }}
      >
        <SaveFeedback
          error={update.error}
          done={done}
          fallback="The channels could not be saved. Please try again."
          isFieldPath={(path) => /^channels\.\d+\.name$/.test(path)}
        />
      </FormActions>
    </form>
  );
}
