import { useId, useState } from "react";
import { Link } from "react-router";
import type { WorkshopMembership } from "@/lib/auth";
import { useSetActiveWorkshop } from "../api/set-active-workshop";

type Props = {
  workshops: WorkshopMembership[];
  activeId: string | null;
  createHref: string;
  onSwitched: () => void;
};

/** A native select: keyboard and touch friendly everywhere. The role in the active workshop shows beside the account. */
export function WorkshopSwitcher({ workshops, activeId, createHref, onSwitched }: Props) {
  const id = useId();
  const setActive = useSetActiveWorkshop();
  const [error, setError] = useState<string | null>(null);

  const active = workshops.find((workshop) => workshop.id === activeId);
  const newLink = (
    <Link to={createHref} className="self-start text-caption text-steel-700 underline-offset-2 hover:underline">
      New workshop…
    </Link>
  );

  // With one workshop there is nothing to switch to: show its name in full instead of a cramped select.
  if (workshops.length === 1 && active) {
    return (
      <div className="flex flex-col gap-1">
        <p className="text-caption font-semibold text-ink-soft">Workshop</p>
        <p className="font-semibold leading-snug text-ink">{active.name}</p>
        {newLink}
      </div>
    );
  }

  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="text-caption font-semibold text-ink-soft">
        Switch workshop
      </label>
      <select
        id={id}
        className="min-h-touch w-full rounded-control border border-line-strong bg-surface px-2 text-caption text-ink disabled:opacity-60"
        value={activeId ?? ""}
        disabled={setActive.isPending}
        onChange={(event) => {
          setError(null);
          setActive.mutate(event.target.value, {
            onSuccess: onSwitched,
            onError: (cause) => setError(cause.message),
          });
        }}
      >
        {activeId ? null : <option value="">Choose a workshop</option>}
        {workshops.map((workshop) => (
          <option key={workshop.id} value={workshop.id}>
            {workshop.name}
          </option>
        ))}
      </select>
      {error ? (
        <p role="alert" className="text-caption text-rust-700">
          {error}
        </p>
      ) : null}
      {newLink}
    </div>
  );
}
