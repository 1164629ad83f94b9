/**
 * Specifications: list, read, create, new versions; a draft from a master unit's recording; and a
 * specification as a file (export, import) for copying a design to another site.
 */
import { Router, type Request } from "express";
import { z } from "zod";
import { fieldMessages } from "../../shared/errors.ts";
import { masterDraftFieldsSchema } from "../../shared/schemas/master.ts";
import { specFileFieldName, specFileSchema, toSpecFile } from "../../shared/schemas/spec-file.ts";
import { specInputSchema } from "../../shared/schemas/spec.ts";
import { specFromMaster } from "../../shared/master-spec.ts";
import { AnalysisInputError } from "../analysis/errors.ts";
import { badRequest, HttpError } from "../http-error.ts";
import { requirePermission, userOf, workshopOf } from "../middleware/guards.ts";
import { addSpecVersion, createSpec, getSpec, listSpecs } from "../services/specs.ts";
import { PoolBusyError } from "../workers/analysis-pool.ts";
import type { AppDeps } from "../app.ts";
import { wavUpload } from "./wav-upload.ts";

export function specRoutes(deps: AppDeps) {
  const { db, storage, pool } = deps;
  const r = Router();
  const read = requirePermission("spec", "read");
  const write = requirePermission("spec", "write");
  const actor = (req: Request) => ({ workshopId: workshopOf(req).id, userId: userOf(req).id });
  const upload = wavUpload(deps);

  r.get("/specs", read, (req, res) => {
    res.json({ specs: listSpecs(db, workshopOf(req).id) });
  });
  r.post("/specs", write, (req, res) => {
    res.status(201).json(createSpec(db, actor(req), specInputSchema.parse(req.body)));
  });

  // A master unit's recording in, a draft specification out (not saved: QA reviews it in the editor).
  r.post("/specs/master-draft", write, upload.precheck(), upload.multipart, async (req, res) => {
    try {
      const { file } = await upload.checkedFile(req);
      const fields = masterDraftFieldsSchema.parse(req.body ?? {});
      const sha256 = await storage.sha256Of(file.path);
      let result;
      try {
        result = await pool.analyzeFile(file.path);
      } catch (error) {
        if (error instanceof AnalysisInputError) throw new HttpError(422, "unprocessable", error.message, { audio: error.message });
        if (error instanceof PoolBusyError) throw new HttpError(503, "busy", "The analysis is busy with other recordings. Nothing was stored; send the master recording again in a minute.");
        throw error;
      }
      const strike = result.strikes[0];
      if (!strike || strike.partials.length === 0) {
        throw new HttpError(422, "unprocessable", "No strike with partials clear of the noise was found in the master recording. Strike the master firmly near the microphone, let it ring, and record again.", { audio: "No partials found" });
      }
      const master = specFromMaster(strike.partials, {
        ...fields,
        source: { fileName: file.originalname.slice(0, 120), sha256, analysedAt: new Date().toISOString() },
      });
      const used = new Map(master.used.map((u) => [u.index, u.label]));
      res.json({
        draft: master.draft,
        strikeNoteHz: master.strikeNoteHz,
        master: {
          fileName: file.originalname.slice(0, 255),
          sha256,
          sampleRate: result.sampleRate,
          durationS: result.durationS,
          warnings: result.warnings,
          partials: strike.partials.map((p, i) => ({ frequencyHz: p.frequencyHz, amplitudeDb: p.amplitudeDb, t60S: p.t60S, beatHz: p.beatHz, label: used.get(i) ?? null })),
        },
      });
    } finally {
      if (req.file) storage.discard(req.file.path);
    }
  });

  r.post("/specs/import", write, (req, res) => {
    const parsed = specFileSchema.safeParse(req.body);
    if (!parsed.success) {
      const fields = fieldMessages(parsed.error);
      const where = Object.keys(fields).map(specFileFieldName).join("; ");
      throw badRequest(`The file is not a specification Tinelog can read. Check: ${where}.`, fields);
    }
    const file = parsed.data;
    const from = file.source?.workshop ? ` from ${file.source.workshop}${file.source.version ? `, version ${file.source.version}` : ""}` : "";
    const input = { ...file.specification, changeNote: file.specification.changeNote || `Imported from a specification file${from}.` };
    res.status(201).json(createSpec(db, actor(req), input));
  });

  r.get("/specs/:id", read, (req, res) => {
    res.json(getSpec(db, workshopOf(req).id, String(req.params.id)));
  });

  r.get("/specs/:id/export", read, (req, res) => {
    const spec = getSpec(db, workshopOf(req).id, String(req.params.id));
    const wanted = z.coerce.number().int().positive().optional().safeParse(req.query.version);
    if (!wanted.success) throw badRequest("Give the version as a whole number, e.g. ?version=2.", { version: "Must be a whole number" });
    const version = spec.versions.find((v) => v.version === (wanted.data ?? spec.currentVersion));
    if (!version) throw new HttpError(404, "not_found", `Specification "${spec.name}" has no version ${wanted.data}; its versions are 1 to ${spec.currentVersion}.`);
    const fileName = `${spec.name.replace(/[^A-Za-z0-9._-]+/g, "-").replace(/^-+|-+$/g, "").slice(0, 60) || "specification"}-v${version.version}.json`;
    res.setHeader("Content-Disposition", `attachment; filename="${fileName}"`);
    res.json(toSpecFile(version, workshopOf(req).name));
  });

  r.post("/specs/:id/versions", write, (req, res) => {
    getSpec(db, workshopOf(req).id, String(req.params.id)); // 404 before validation: never hint at another workshop's ids
    res.status(201).json(addSpecVersion(db, actor(req), String(req.params.id), specInputSchema.parse(req.body)));
  });
  return r;
}
