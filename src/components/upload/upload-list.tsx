/**
 * The list of files on their way to the server, one row each with its progress, shared by the
 * unit and batch uploads. Files are listed newest first; a refused file shows why, as an alert.
 */
import { useState, type ReactNode } from "react";

export type UploadItem = { key: string; name: string; size: number; progress: number; state: "waiting" | "uploading" | "accepted" | "refused"; error?: string };

/** The rows and the two ways they change: new files arrive (waiting), a row is patched. */
export function useUploadItems<T extends UploadItem = UploadItem>() {
  const [items, setItems] = useState<T[]>([]);
  const patch = (key: string, change: Partial<T>) => setItems((all) => all.map((item) => (item.key === key ? { ...item, ...change } : item)));
  const enqueue = (files: File[]): T[] => {
    const fresh = files.map((file, i) => ({ key: `${Date.now()}-${i}-${file.name}`, name: file.name, size: file.size, progress: 0, state: "waiting" }) as T);
    setItems((all) => [...fresh, ...all]);
    return fresh;
  };
  return { items, patch, enqueue };
}

export function UploadList<T extends UploadItem>({ label, items, status }: { label: string; items: T[]; status: (item: T) => ReactNode }) {
  if (items.length === 0) return null;
  return (
    <ul aria-label={label} className="divide-y divide-line rounded-control border border-line">
      {items.map((item) => (
        <li key={item.key} className="flex flex-wrap items-center justify-between gap-3 px-4 py-3">
          <span className="min-w-0">
            <span className="block [overflow-wrap:anywhere] font-medium">{item.name}</span>
            {item.state === "refused" ? (
              <span role="alert" className="block text-caption text-rust-700">
                {item.error}
              </span>
            ) : (
              status(item)
            )}
          </span>
          {item.state === "uploading" || item.state === "waiting" ? (
            <progress className="h-2 w-32 accent-steel-600" max={1} value={item.progress} aria-label={`Upload of ${item.name}`} />
          ) : null}
        </li>
      ))}
    </ul>
  );
}
