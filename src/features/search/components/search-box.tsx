/**
 * The shell's search box: serials, batch codes, certificate numbers and customers of the active
 * workshop, results grouped by kind, each a link. "/" anywhere outside a text field puts the
 * cursor in it; Enter opens the first result; Escape closes the results.
 */
import { useEffect, useId, useRef, useState, type KeyboardEvent } from "react";
import { Link, useNavigate } from "react-router";
import type { SearchResults } from "@shared/schemas/corrections";
import { batchStateLabels } from "@shared/schemas/batch";
import { Spinner } from "@/components/ui/spinner";
import { useSearch } from "../api/search";

type Hrefs = { unit: (id: string) => string; batch: (id: string) => string };
type Item = { key: string; href: string; title: string; note: string };

function groups(r: SearchResults, href: Hrefs): { label: string; items: Item[] }[] {
  return [
    { label: "Units", items: r.units.map((u) => ({ key: `u${u.id}`, href: href.unit(u.id), title: u.serial, note: `batch ${u.batchCode}` })) },
    { label: "Batches", items: r.batches.map((b) => ({ key: `b${b.id}`, href: href.batch(b.id), title: b.code, note: `${b.specName} · ${batchStateLabels[b.state].toLowerCase()}` })) },
    {
      label: "Certificates",
      items: r.certificates.map((c) => ({ key: `c${c.number}`, href: c.unitId ? href.unit(c.unitId) : href.batch(c.batchId), title: c.number, note: `${c.label}${c.state === "current" ? "" : ` · ${c.state}`}` })),
    },
    { label: "Customers", items: r.customers.map((c) => ({ key: `k${c.unitId}`, href: href.unit(c.unitId), title: c.name ?? c.email ?? c.serial, note: `unit ${c.serial}${c.name && c.email ? ` · ${c.email}` : ""}` })) },
  ].filter((g) => g.items.length > 0);
}

/** True when "/" is being typed into something, so the shortcut must not take it. */
function typingInField(target: EventTarget | null): boolean {
  const el = target as HTMLElement | null;
  return !!el && (el.isContentEditable || ["INPUT", "TEXTAREA", "SELECT"].includes(el.tagName));
}

export function SearchBox({ workshopId, hrefs }: { workshopId: string; hrefs: Hrefs }) {
  const [text, setText] = useState("");
  const [q, setQ] = useState("");
  const [open, setOpen] = useState(false);
  const input = useRef<HTMLInputElement>(null);
  const box = useRef<HTMLDivElement>(null);
  const navigate = useNavigate();
  const id = useId();
  const results = useSearch(workshopId, q);

  // A short pause after typing before asking the server.
  useEffect(() => {
    const timer = setTimeout(() => setQ(text.trim()), 180);
    return () => clearTimeout(timer);
  }, [text]);

  useEffect(() => {
    const onKey = (event: globalThis.KeyboardEvent) => {
      if (event.key === "/" && !event.ctrlKey && !event.metaKey && !event.altKey && !typingInField(event.target)) {
        event.preventDefault();
        input.current?.focus();
        input.current?.select();
        setOpen(true);
      }
    };
    const onPointer = (event: PointerEvent) => {
      if (box.current && !box.current.contains(event.target as Node)) setOpen(false);
    };
    document.addEventListener("keydown", onKey);
    document.addEventListener("pointerdown", onPointer);
    return () => {
      document.removeEventListener("keydown", onKey);
      document.removeEventListener("pointerdown", onPointer);
    };
  }, []);

  const found = results.data && q ? groups(results.data, hrefs) : [];
  const first = found[0]?.items[0];
  const go = (href: string) => {
    setOpen(false);
    setText("");
    input.current?.blur();
    navigate(href);
  };
  const onKeyDown = (event: KeyboardEvent<HTMLInputElement>) => {
    if (event.key === "Escape") {
      setOpen(false);
      input.current?.blur();
    } else if (event.key === "Enter" && first) {
      event.preventDefault();
      go(first.href);
    }
  };

  return (
    <div ref={box} role="search" className="relative">
      <label htmlFor={id} className="sr-only">
        Search the workshop
      </label>
      <div className="relative">
        <input
          ref={input}
          id={id}
          type="search"
          value={text}
          autoComplete="off"
          placeholder="Search the workshop"
          title="Serials, batch codes, certificate numbers, customer names and e-mails"
          aria-describedby={`${id}-hint`}
          aria-controls={`${id}-results`}
          aria-expanded={open && text.trim().length > 0}
          onChange={(event) => {
            setText(event.target.value);
            setOpen(true);
          }}
          onFocus={() => setOpen(true)}
          onKeyDown={onKeyDown}
          className="block min-h-touch w-full rounded-control border border-line-strong bg-surface pl-3 pr-9 text-body placeholder:text-caption placeholder:text-ink-faint"
        />
        <kbd id={`${id}-hint`} aria-label="Shortcut: slash" className="pointer-events-none absolute right-2 top-1/2 -translate-y-1/2 rounded border border-line-strong bg-sunken px-1.5 text-caption text-ink-soft">
          /
        </kbd>
      </div>
      {open && text.trim() ? (
        <div id={`${id}-results`} role="region" aria-label="Search results" className="absolute left-0 z-20 mt-1 max-h-[70vh] w-[min(24rem,90vw)] overflow-y-auto rounded-panel border border-line bg-surface p-2 shadow-panel">
          {results.isError ? (
            <p className="px-2 py-2 text-caption text-rust-700">{results.error.message}</p>
          ) : !results.data || (results.isFetching && found.length === 0) ? (
            <div className="px-2 py-2">
              <Spinner size="sm" label="Searching…" />
            </div>
          ) : found.length === 0 ? (
            <p className="px-2 py-2 text-caption text-ink-soft">Nothing in this workshop matches “{q}”.</p>
          ) : (
            found.map((g) => (
              <section key={g.label} aria-label={g.label} className="py-1">
                <h2 className="px-2 text-caption font-semibold uppercase tracking-wide text-ink-faint">{g.label}</h2>
                <ul>
                  {g.items.map((item) => (
                    <li key={item.key}>
                      <Link to={item.href} onClick={() => go(item.href)} className="flex flex-col rounded-control px-2 py-1.5 hover:bg-steel-50 focus:bg-steel-50">
                        <span className="font-semibold text-steel-700">{item.title}</span>
                        <span className="text-caption text-ink-soft">{item.note}</span>
                      </Link>
                    </li>
                  ))}
                </ul>
              </section>
            ))
          )}
          {found.length ? <p className="px-2 pt-1 text-caption text-ink-faint">Enter opens the first result.</p> : null}
        </div>
      ) : null}
    </div>
  );
}
