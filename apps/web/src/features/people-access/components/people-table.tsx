import { roleLabels, roles, type CurrentUser, type Market, type Person, type Role } from "@tributary/contracts";
import { useId, useState, type FormEvent } from "react";
import { DataTable, type DataTableColumn } from "../../../components/data-table/data-table";
import { Button } from "../../../components/ui/button";
import { ErrorState } from "../../../components/ui/error-state";
import { inputClass } from "../../../components/ui/field";
import { LoadingState } from "../../../components/ui/loading-state";
import { ApiError } from "../../../lib/api-client";
import { formatDateTime } from "../../../lib/format";
import { usePeople } from "../api/get-people";
import { personUpdateInput, useUpdatePerson } from "../api/update-person";
import { MarketChoice } from "./market-choice";

const messageOf = (error: unknown) => (error instanceof ApiError ? error.message : "The change could not be saved. Please try again.");

/** Change one person's role and markets, or disable or enable them. */
function PersonEditor({ person, markets, self, onClose }: { person: Person; markets: readonly Market[]; self: boolean; onClose: () => void }) {
  const id = useId();
  const [role, setRole] = useState<Role>(person.role);
  const [marketIds, setMarketIds] = useState<string[]>(person.markets.map((m) => m.id));
  const [error, setError] = useState<string | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const update = useUpdatePerson();

  const save = (event: FormEvent) => {
    event.preventDefault();
    setDone(null);
    if (role === "market_manager" && marketIds.length === 0) {
      setError("Choose at least one market for a market manager");
      return;
    }
    const parsed = personUpdateInput.safeParse({ role, marketIds: role === "market_manager" ? marketIds : [] });
    if (!parsed.success) {
      setError(parsed.error.issues[0]?.message ?? "Check the role and markets");
      return;
    }
    setError(null);
    update.mutate({ userId: person.id, ...parsed.data }, { onSuccess: (p) => setDone(`Saved: ${p.name} is now ${roleLabels[p.role]}${p.markets.length ? ` for ${p.markets.map((m) => m.name).join(", ")}` : ""}.`), onError: (e) => setError(messageOf(e)) });
  };
  const toggleDisabled = () => {
    setDone(null);
    update.mutate(
      { userId: person.id, disabled: !person.disabled },
      { onSuccess: (p) => setDone(p.disabled ? `${p.name} is disabled and signed out.` : `${p.name} can sign in again.`), onError: (e) => setError(messageOf(e)) },
    );
  };

  return (
    <form onSubmit={save} noValidate aria-label={`Change ${person.name}`} className="space-y-4 rounded-lg border border-stream-200 bg-stream-50/50 p-4">
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <h3 className="text-body font-semibold text-ink-900">{person.name}</h3>
          <p className="text-small text-ink-700">
            {person.email}
            {person.disabled ? " · disabled" : ""}
          </p>
        </div>
        <Button variant="quiet" onClick={onClose}>
          Close
        </Button>
      </div>
      {self ? <p className="text-small text-ink-700">This is you: you cannot change your own role or disable yourself.</p> : null}
      <div>
        <label htmlFor={`${id}-role`} className="block text-small font-medium text-ink-800">
          Role
        </label>
        <select id={`${id}-role`} className={`${inputClass} mt-1 w-48`} value={role} disabled={self} onChange={(event) => setRole(event.target.value as Role)}>
          {roles.map((r) => (
            <option key={r} value={r}>
              {roleLabels[r]}
            </option>
          ))}
        </select>
      </div>
      {role === "market_manager" ? (
        <MarketChoice idPrefix={`${id}-markets`} markets={markets} value={marketIds} onChange={setMarketIds} />
      ) : (
        <p className="text-small text-ink-700">{roleLabels[role]}s see every market.</p>
      )}
      <p className="text-caption text-ink-600">A change of role ends the person's sessions: they sign in again with the new role.</p>
      {error ? (
        <p role="alert" className="text-small font-medium text-alert-700">
          {error}
        </p>
      ) : null}
      {done ? (
        <p role="status" className="text-small font-medium text-ok-700">
          {done}
        </p>
      ) : null}
      <div className="flex flex-wrap gap-2">
        <Button type="submit" disabled={update.isPending || self}>
          Save role and markets
        </Button>
        <Button variant="secondary" onClick={toggleDisabled} disabled={update.isPending || self}>
          {person.disabled ? "Enable" : "Disable"}
        </Button>
      </div>
    </form>
  );
}

/** Everyone with an account, their role and markets, with a form to change them. */
export function PeopleTable({ user, markets }: { user: CurrentUser; markets: readonly Market[] }) {
  const people = usePeople();
  const [editing, setEditing] = useState<string | null>(null);
  if (people.isPending) return <LoadingState label="Loading people…" />;
  if (people.isError) return <ErrorState title="People could not be loaded" message={people.error.message} onRetry={() => void people.refetch()} />;
  const columns: DataTableColumn<Person>[] = [
    { id: "name", header: "Name", value: (p) => p.name, cell: (p) => <span className="font-medium">{p.name}</span> },
    { id: "email", header: "E-mail", value: (p) => p.email },
    { id: "role", header: "Role", value: (p) => roleLabels[p.role] },
    { id: "markets", header: "Markets", value: (p) => (p.role === "market_manager" ? p.markets.map((m) => m.name).join(", ") : "every market") },
    {
      id: "status",
      header: "Status",
      value: (p) => (p.disabled ? "Disabled" : "Active"),
      cell: (p) => (p.disabled ? <span className="rounded-sm bg-alert-100 px-1.5 py-0.5 text-caption text-alert-700">Disabled</span> : "Active"),
    },
    { id: "last", header: "Last sign-in", value: (p) => p.lastSignInAt, cell: (p) => (p.lastSignInAt ? formatDateTime(p.lastSignInAt) : <span className="text-ink-500">never</span>) },
    {
      id: "change",
      header: "Change",
      value: () => null,
      sortable: false,
      cell: (p) => (
        <Button variant="secondary" className="px-2! py-1!" onClick={() => setEditing(p.id)} aria-label={`Change ${p.name}`}>
          Change
        </Button>
      ),
    },
  ];
  const person = people.data.find((p) => p.id === editing);
  return (
    <div className="space-y-3">
      <DataTable caption="People" rows={people.data} columns={columns} rowKey={(p) => p.id} csvFileName="people.csv" initialSort={{ id: "name" }} pageSize={20} />
      {person ? <PersonEditor key={person.id} person={person} markets={markets} self={person.id === user.id} onClose={() => setEditing(null)} /> : null}
    </div>
  );
}
