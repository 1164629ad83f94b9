/**
 * Import a specification file (exported by another site): read and checked here with the same
 * schema as the server, each problem named by where it is in the file; a good file fills the editor.
 */
import { useRef, useState } from "react";
import { fieldMessages } from "@shared/errors";
import { specFileFieldName, specFileSchema, type SpecFile } from "@shared/schemas/spec-file";
import type { SpecFormValues } from "@shared/schemas/spec";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";

/** At most this many bytes: a specification file is a few kilobytes. */
const MAX_FILE_BYTES = 256 * 1024;

export function SpecFileImport({ onLoaded }: { onLoaded: (values: SpecFormValues, from: string) => void }) {
  const input = useRef<HTMLInputElement>(null);
  const [problems, setProblems] = useState<{ where: string; message: string }[] | null>(null);
  const [message, setMessage] = useState<string | null>(null);

  const read = async (file: File) => {
    setProblems(null);
    setMessage(null);
    if (file.size > MAX_FILE_BYTES) return setMessage(`${file.name} is ${(file.size / 1024).toFixed(0)} KiB; a specification file is a few KiB. Choose the file exported from Tinelog.`);
    let json: unknown;
    try {
      json = JSON.parse(await file.text());
    } catch {
      return setMessage(`${file.name} is not a JSON file. Choose the file exported from a specification's page ("Export file").`);
    }
    const parsed = specFileSchema.safeParse(json);
    if (!parsed.success) {
      setMessage(`${file.name} cannot be used as it is:`);
      setProblems(Object.entries(fieldMessages(parsed.error)).map(([path, m]) => ({ where: specFileFieldName(path), message: m })));
      return;
    }
    const data = json as SpecFile;
    const source = data.source?.workshop ? ` from ${data.source.workshop}${data.source.version ? `, version ${data.source.version}` : ""}` : "";
    onLoaded({ ...data.specification, changeNote: "" }, `${file.name}${source}`);
  };

  return (
    <div className="flex flex-col gap-3" role="group" aria-label="From a file">
      <p className="max-w-prose text-ink-soft">Choose a specification file exported from Tinelog — at your other site, for instance. It fills the editor below; nothing is saved until you create the specification.</p>
      <input
        ref={input}
        type="file"
        accept=".json,application/json"
        className="sr-only"
        aria-label="Specification file"
        onChange={(event) => {
          const file = event.target.files?.[0];
          event.target.value = "";
          if (file) void read(file);
        }}
      />
      <div>
        <Button variant="secondary" onClick={() => input.current?.click()}>
          Choose a file…
        </Button>
      </div>
      {message ? (
        <Alert tone="error" title={message}>
          {problems ? (
            <ul className="list-disc pl-5">
              {problems.map((p) => (
                <li key={p.where + p.message}>
                  <span className="font-medium">{p.where}</span>: {p.message}
                </li>
              ))}
            </ul>
          ) : null}
        </Alert>
      ) : null}
    </div>
  );
}
