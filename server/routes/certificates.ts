/** Certificates: issue, preview, list, PDF, re-send, withdraw; and the public verification look-up. */
import { Router, type Request } from "express";
import { rateLimit } from "express-rate-limit";
import { issueCertificateSchema, verificationCodeSchema } from "../../shared/schemas/certificate.ts";
import { withdrawCertificateSchema } from "../../shared/schemas/corrections.ts";
import { HttpError, notFound } from "../http-error.ts";
import { publicRoute, requirePermission, userOf, workshopOf } from "../middleware/guards.ts";
import { certificatePdf, issueCertificate, listCertificates, previewCertificate, resendCertificate, verifyByCode, withdrawCertificate } from "../services/certificates.ts";
import { findAnyCertificate } from "../services/certificate-store.ts";
import { findUnit } from "../services/strikes.ts";
import type { AppDeps } from "../app.ts";

/** Who issues: the signed-in member with their name and role (printed on the certificate). */
export function issuerOf(req: Request) {
  const w = workshopOf(req);
  const u = userOf(req);
  return { workshopId: w.id, userId: u.id, name: u.name, role: w.role };
}

export function certificateRoutes(deps: AppDeps) {
  const { db, sqlite, certificates } = deps;
  const r = Router();
  const issue = requirePermission("certificate", "issue");
  const read = requirePermission("certificate", "read");

  r.get("/units/:id/certificates", read, (req, res) => {
    const u = findUnit(db, workshopOf(req).id, String(req.params.id));
    res.json({ certificates: listCertificates(db, u.workshopId, u.id, deps.env.baseUrl) });
  });

  r.post("/units/:id/certificates", issue, async (req, res) => {
    findUnit(db, workshopOf(req).id, String(req.params.id));
    const input = issueCertificateSchema.parse(req.body);
    const c = await issueCertificate(certificates, issuerOf(req), String(req.params.id), input);
    res.status(201).json({ number: c.number, verifyUrl: c.verifyUrl, certificate: c });
  });

  r.post("/units/:id/certificates/preview", issue, async (req, res) => {
    findUnit(db, workshopOf(req).id, String(req.params.id));
    const input = issueCertificateSchema.parse(req.body);
    const pdf = await previewCertificate(certificates, issuerOf(req), String(req.params.id), input);
    res.type("application/pdf").set("Content-Disposition", 'inline; filename="certificate-preview.pdf"').send(pdf);
  });

  r.get("/certificates/:number/pdf", read, async (req, res) => {
    const pdf = await certificatePdf(certificates, workshopOf(req).id, String(req.params.number), req.query.original === "1");
    res.type("application/pdf").set("Content-Disposition", `inline; filename="${String(req.params.number)}.pdf"`).send(pdf);
  });

  r.post("/certificates/:number/send", issue, async (req, res) => {
    try {
      res.json(await resendCertificate(certificates, issuerOf(req), String(req.params.number)));
    } catch (error) {
      const retry = (error as { retryAfterS?: number }).retryAfterS;
      if (error instanceof HttpError && retry) res.set("Retry-After", String(retry));
      throw error;
    }
  });

  r.post("/certificates/:number/withdraw", requirePermission("certificate", "withdraw"), async (req, res) => {
    findAnyCertificate(db, workshopOf(req).id, String(req.params.number)); // 404 before validation
    const { reason } = withdrawCertificateSchema.parse(req.body);
    res.json(await withdrawCertificate({ ...certificates, sqlite }, issuerOf(req), String(req.params.number), reason));
  });

  // Public and rate limited: a code is random, but nobody should be able to try codes at speed.
  const verifyLimit = rateLimit({ windowMs: 60_000, limit: 30, standardHeaders: "draft-8", legacyHeaders: false, handler: (_req, res) => res.status(429).json({ error: { code: "too_many_requests", message: "Too many verification look-ups from this address; wait a minute and try again." } }) });
  // An unknown code is 404 for API callers. The verification page asks with ?notFound=ok and gets
  // 200 { found: false } instead: a customer with a mistyped link is an expected visitor, not an
  // error (the browser would log a 404 in the console).
  r.get("/verify/:code", publicRoute, verifyLimit, (req, res) => {
    const code = verificationCodeSchema.safeParse(String(req.params.code));
    const found = code.success ? verifyByCode(certificates, code.data) : null;
    res.set("Cache-Control", "no-store");
    if (found) return res.json({ found: true, ...found });
    if (req.query.notFound === "ok") return res.json({ found: false });
    throw new HttpError(404, "not_found", "No certificate has this verification code. Check that the whole link (or the QR code on the certificate) was used.");
  });

  return r;
}
