/**
 * Tamper evidence for certificates, so a customer can tell an altered PDF from ours: an Ed25519 key kept as PEM files in its own
 * directory (never inside the SQLite file), RFC 8785 canonical JSON of the certificate data,
 * a detached signature over it, and the PDF's SHA-256.
 */
import { createHash, createPrivateKey, createPublicKey, generateKeyPairSync, randomBytes, sign, verify, type KeyObject } from "node:crypto";
import { chmodSync, closeSync, existsSync, mkdirSync, openSync, readFileSync, statSync, writeSync } from "node:fs";
import { join } from "node:path";

export const PRIVATE_KEY_FILE = "certificate-signing-key.pem";
export const PUBLIC_KEY_FILE = "certificate-signing-key.pub.pem";

export interface SigningKey {
  privateKey: KeyObject;
  publicKey: KeyObject;
  /** SPKI PEM of the public key, for publishing or for a verifier elsewhere. */
  publicKeyPem: string;
  /** First 16 hex digits of the SHA-256 of the public key's SPKI DER: names the key in records. */
  keyId: string;
}

/** A problem with the key files; the message says which file and what to do. */
export class SigningKeyError extends Error {
  override name = "SigningKeyError";
}

function describe(error: unknown): string {
  return error instanceof Error ? error.message : String(error);
}

/** Writes a new file; fails if it exists, so two processes starting at once cannot overwrite each other's key. */
function writeExclusive(path: string, contents: string, mode: number): boolean {
  let fd: number;
  try {
    fd = openSync(path, "wx", mode);
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === "EEXIST") return false;
    throw new SigningKeyError(`Cannot create the signing key file ${path}: ${describe(error)}. Check that DATA_DIR is writable.`);
  }
  try {
    writeSync(fd, contents);
  } finally {
    closeSync(fd);
  }
  // The process umask may have narrowed or the file system ignored the mode: set it explicitly.
  chmodSync(path, mode);
  return true;
}

function keyIdOf(publicKey: KeyObject): string {
  return createHash("sha256").update(publicKey.export({ type: "spki", format: "der" })).digest("hex").slice(0, 16);
}

/**
 * Loads the workshop's Ed25519 signing key from `dir`, creating the directory (mode 0700) and a
 * new key pair (private key PKCS#8 PEM, mode 0600; public key SPKI PEM) on first use.
 * Keep `dir` apart from the database file (e.g. `DATA_DIR/keys`) so a copy of the database alone
 * cannot forge certificates.
 * @throws SigningKeyError when a file is unreadable, not an Ed25519 key, readable by others, or
 *   when the public key file does not belong to the private key.
 */
export function loadOrCreateSigningKey(dir: string): SigningKey {
  try {
    mkdirSync(dir, { recursive: true, mode: 0o700 });
  } catch (error) {
    throw new SigningKeyError(`Cannot create the key directory ${dir}: ${describe(error)}. Check that DATA_DIR is writable.`);
  }
  const privatePath = join(dir, PRIVATE_KEY_FILE);
  const publicPath = join(dir, PUBLIC_KEY_FILE);

  if (!existsSync(privatePath)) {
    const pair = generateKeyPairSync("ed25519");
    const privatePem = pair.privateKey.export({ type: "pkcs8", format: "pem" }).toString();
    // If another process won the race, fall through and load its key instead.
    writeExclusive(privatePath, privatePem, 0o600);
  }

  if (process.platform !== "win32") {
    const mode = statSync(privatePath).mode & 0o777;
    if (mode & 0o077) {
      throw new SigningKeyError(
        `The signing key ${privatePath} can be read by other users (mode ${mode.toString(8)}). Run: chmod 600 ${privatePath}`,
      );
    }
  }

  let privateKey: KeyObject;
  try {
    privateKey = createPrivateKey(readFileSync(privatePath));
  } catch (error) {
    throw new SigningKeyError(`Cannot read the signing key ${privatePath}: ${describe(error)}. Restore it from a backup; a new key would not verify earlier certificates.`);
  }
  if (privateKey.asymmetricKeyType !== "ed25519") {
    throw new SigningKeyError(`The signing key ${privatePath} is a ${privateKey.asymmetricKeyType} key; certificates need an Ed25519 key.`);
  }
  const publicKey = createPublicKey(privateKey);
  const publicKeyPem = publicKey.export({ type: "spki", format: "pem" }).toString();

  if (!writeExclusive(publicPath, publicKeyPem, 0o644)) {
    const stored = readFileSync(publicPath, "utf8");
    let storedKey: KeyObject;
    try {
      storedKey = createPublicKey(stored);
    } catch (error) {
      throw new SigningKeyError(`Cannot read the public key ${publicPath}: ${describe(error)}. Delete it; it is recreated from the private key.`);
    }
    if (!storedKey.equals(publicKey)) {
      throw new SigningKeyError(`The public key ${publicPath} does not belong to ${privatePath}. Delete the public key file; it is recreated from the private key.`);
    }
  }
  return { privateKey, publicKey, publicKeyPem, keyId: keyIdOf(publicKey) };
}

/** A value `canonicalize` cannot represent; the message names the path to the offending value. */
export class CanonicalizationError extends Error {
  override name = "CanonicalizationError";
}

/**
 * Canonical JSON per RFC 8785 (JSON Canonicalization Scheme) for plain JSON data: object keys
 * sorted by UTF-16 code units, no whitespace, strings and numbers serialised as ECMAScript's
 * JSON.stringify does (which is what RFC 8785 §3.2.2 prescribes). Properties whose value is
 * `undefined` are left out, as JSON.stringify does.
 * @throws CanonicalizationError for NaN/Infinity, BigInt, functions, symbols, class instances
 *   (Date, Buffer, Map…), `undefined` inside an array, and cycles.
 */
export function canonicalize(data: unknown): string {
  const seen = new Set<object>();
  const walk = (value: unknown, path: string): string => {
    if (value === null) return "null";
    switch (typeof value) {
      case "boolean":
        return value ? "true" : "false";
      case "string":
        return JSON.stringify(value);
      case "number":
        if (!Number.isFinite(value)) throw new CanonicalizationError(`${path} is ${value}; JSON has no such number. Store null or a finite number.`);
        return JSON.stringify(value);
      case "object": {
        if (seen.has(value)) throw new CanonicalizationError(`${path} refers back to itself; canonical JSON cannot hold a cycle.`);
        if (Array.isArray(value)) {
          seen.add(value);
          const items = value.map((item, i) => {
            if (item === undefined) throw new CanonicalizationError(`${path}[${i}] is undefined; use null in arrays.`);
            return walk(item, `${path}[${i}]`);
          });
          seen.delete(value);
          return `[${items.join(",")}]`;
        }
        const proto = Object.getPrototypeOf(value);
        if (proto !== Object.prototype && proto !== null) {
          throw new CanonicalizationError(`${path} is a ${proto?.constructor?.name ?? "non-plain"} object; convert it to plain JSON first (e.g. a date to an ISO string).`);
        }
        seen.add(value);
        const record = value as Record<string, unknown>;
        // Array.prototype.sort compares UTF-16 code units, the order RFC 8785 §3.2.3 requires.
        const keys = Object.keys(record)
          .filter((k) => record[k] !== undefined)
          .sort();
        const members = keys.map((k) => `${JSON.stringify(k)}:${walk(record[k], `${path}.${k}`)}`);
        seen.delete(value);
        return `{${members.join(",")}}`;
      }
      default:
        throw new CanonicalizationError(`${path} is a ${typeof value}; canonical JSON holds only null, booleans, numbers, strings, arrays and plain objects.`);
    }
  };
  return walk(data, "$");
}

/** Ed25519 signature of the canonical JSON (UTF-8 bytes), base64. */
export function signCertificate(canonical: string, key: SigningKey | KeyObject): string {
  const privateKey = "privateKey" in key ? key.privateKey : key;
  return sign(null, Buffer.from(canonical, "utf8"), privateKey).toString("base64");
}

/**
 * True when `signature` (base64) is a valid Ed25519 signature of `canonical` under `publicKey`
 * (a KeyObject or SPKI PEM). A malformed signature or key gives false, not an exception, so a
 * verification page can say "does not verify" for any tampered record.
 */
export function verifyCertificate(canonical: string, signature: string, publicKey: KeyObject | string): boolean {
  try {
    const key = typeof publicKey === "string" ? createPublicKey(publicKey) : publicKey;
    if (key.asymmetricKeyType !== "ed25519") return false;
    if (!/^[A-Za-z0-9+/]*={0,2}$/.test(signature)) return false;
    const bytes = Buffer.from(signature, "base64");
    if (bytes.length !== 64) return false; // an Ed25519 signature is 64 bytes (RFC 8032 §5.1.6)
    return verify(null, Buffer.from(canonical, "utf8"), key, bytes);
  } catch {
    return false;
  }
}

/** SHA-256 of the bytes, lower-case hex (64 characters). */
export function sha256Hex(data: Buffer | Uint8Array | string): string {
  return createHash("sha256").update(data).digest("hex");
}

/** Bytes of randomness in a verification code: 18 bytes = 144 bits, 24 base64url characters. */
export const VERIFICATION_CODE_BYTES = 18;

/** A random, URL-safe verification code (base64url, 144 bits from the CSPRNG), unrelated to the certificate number. */
export function newVerificationCode(): string {
  return randomBytes(VERIFICATION_CODE_BYTES).toString("base64url");
}
