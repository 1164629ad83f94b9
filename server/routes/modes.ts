/**
 * Predicted modes of a spec version and the mode map. The import takes a file (multipart field
 * `modes`, CSV or JSON, with the column mapping from the preview) or a JSON body in our own format;
 * both run through the same table reader as the browser's preview, and any problem refuses the
 * whole file with its line numbers.
 */
import type { NextFunction, Request, Response } from "express";
import { Router } from "express";
import multer from "multer";
import { decodeTableBytes, importModeText, ModeTableError, modesFromTable, type ColumnMapping, type ModeTable } from "../../shared/mode-import.ts";
import { MAX_MODE_FILE_BYTES, modeListFieldsSchema, modeListJsonSchema, modeMapQuerySchema, modelConditions, type ModelCondition } from "../../shared/schemas/modes.ts";
import { badRequest, HttpError } from "../http-error.ts";
import { requirePermission, userOf, workshopOf } from "../middleware/guards.ts";
import { findSpec, findSpecVersion, getModeMap, importModeLists, importProblems, listModeLists } from "../services/modes.ts";
import type { AppDeps } from "../app.ts";

const tooLarge = () => new HttpError(413, "payload_too_large", `The mode list is larger than ${MAX_MODE_FILE_BYTES / 1024} KB. Export only the mode table (mode number and frequency, a few hundred rows at most).`);

export function modeRoutes({ db }: AppDeps) {
  const r = Router();
  const read = requirePermission("spec", "read");
  const write = requirePermission("spec", "write");

  const receive = multer({ storage: multer.memoryStorage(), limits: { fileSize: MAX_MODE_FILE_BYTES, files: 1, fields: 10, fieldSize: 4096, parts: 12 } }).single("modes");
  const multipart = (req: Request, res: Response, next: NextFunction) => {
    if (!(req.get("content-type") ?? "").startsWith("multipart/form-data")) return next();
    if (Number(req.get("content-length") ?? 0) > MAX_MODE_FILE_BYTES + 64 * 1024) return next(tooLarge());
    receive(req, res, (error: unknown) => {
      if (!error) return next();
      if (error instanceof multer.MulterError) {
        if (error.code === "LIMIT_FILE_SIZE") return next(tooLarge());
        if (error.code === "LIMIT_UNEXPECTED_FILE") return next(badRequest('Put the mode list in the field "modes", one file per request.', { modes: "Expected one file in the field modes" }));
        return next(badRequest(`The upload could not be read (${error.message}).`));
      }
      next(error);
    });
  };
  const versionInWorkshop = (req: Request, _res: Response, next: NextFunction) => {
    try {
      findSpecVersion(db, workshopOf(req).id, String(req.params.id), String(req.params.versionId));
      next();
    } catch (error) {
      next(error);
    }
  };

  r.get("/specs/:id/versions/:versionId/predicted-modes", read, (req, res) => {
    res.json({ lists: listModeLists(db, workshopOf(req).id, String(req.params.id), String(req.params.versionId)) });
  });

  // 404 for another workshop's ids before the body is read or validated.
  r.post("/specs/:id/versions/:versionId/predicted-modes", write, versionInWorkshop, multipart, (req, res) => {
    const actor = { workshopId: workshopOf(req).id, userId: userOf(req).id };
    let input: Parameters<typeof importModeLists>[4];
    if (req.file || (req.get("content-type") ?? "").startsWith("multipart/form-data")) {
      if (!req.file) throw badRequest('Attach the mode list (CSV or JSON) in the field "modes".', { modes: "No file received" });
      const fields = modeListFieldsSchema.parse(req.body ?? {});
      let text: string;
      let parsed;
      try {
        text = decodeTableBytes(new Uint8Array(req.file.buffer));
        parsed = importModeText(text, fields.mapping as Partial<ColumnMapping> | undefined);
      } catch (error) {
        if (error instanceof ModeTableError) throw badRequest(error.message, { [error.line ? `line ${error.line}` : "modes"]: error.message });
        throw error;
      }
      if (parsed.errors.length) throw importProblems(parsed.errors);
      const meta = parsed.table.meta;
      const metaCondition = (modelConditions as readonly string[]).includes(meta.condition ?? "") ? (meta.condition as ModelCondition) : undefined;
      input = {
        name: fields.name ?? meta.name?.trim().slice(0, 120) ?? "",
        condition: fields.condition ?? metaCondition ?? "free",
        youngsModulusGPa: fields.youngsModulusGPa ?? meta.youngsModulusGPa ?? null,
        densityKgM3: fields.densityKgM3 ?? meta.densityKgM3 ?? null,
        sourceName: req.file.originalname || null,
        modes: parsed.modes,
      };
    } else {
      const body = modeListJsonSchema.parse(req.body ?? {});
      // The same row rules as a file (rigid-body below 1 Hz, each mode once per condition).
      const table: ModeTable = {
        format: "json",
        delimiter: null,
        headerLine: 0,
        columns: ["mode", "frequencyHz", "label", "kind", "condition"],
        rows: body.modes.map((m, i) => ({ line: i + 1, cells: { mode: String(m.mode), frequencyHz: String(m.frequencyHz), label: m.label, kind: m.kind ?? "", condition: m.condition ?? "" } })),
        notes: [],
        meta: {},
      };
      const parsed = modesFromTable(table, { mode: "mode", frequencyHz: "frequencyHz", label: "label", kind: "kind", condition: "condition", frequencyUnit: "Hz" });
      if (parsed.errors.length) throw importProblems(parsed.errors.map((e) => ({ line: e.line, message: e.message.replace(/ \(also on line (\d+)\)/, " (also as item $1)") })), "item");
      input = { name: body.name, condition: body.condition, youngsModulusGPa: body.youngsModulusGPa, densityKgM3: body.densityKgM3, sourceName: null, modes: parsed.modes };
    }
    const lists = importModeLists(db, actor, String(req.params.id), String(req.params.versionId), input);
    res.status(201).json({ ...lists[0], lists });
  });

  r.get("/specs/:id/mode-map", read, (req, res) => {
    const workshopId = workshopOf(req).id;
    // The specification first: another workshop's ids give 404 before the query is judged.
    const query = req.query as Record<string, unknown>;
    const id = String(req.params.id);
    findSpec(db, workshopId, id);
    const parsed = modeMapQuerySchema.parse(Object.fromEntries(Object.entries(query).map(([k, v]) => [k, Array.isArray(v) ? v.join(",") : v])));
    res.json(getModeMap(db, workshopId, id, parsed));
  });
  return r;
}
