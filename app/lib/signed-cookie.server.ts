import { createHmac, createSecretKey, timingSafeEqual, type KeyObject } from "node:crypto";
import { createCookie, type Cookie, type CookieOptions } from "react-router";

/**
 * A signed cookie in the exact format of React Router's `createCookie` with `secrets` (the value
 * encoded as React Router encodes it, then `.` and the HMAC-SHA-256 in base64 without padding), so
 * cookies already issued stay valid. The difference: the secret's key is made once, not imported
 * through WebCrypto on every request.
 */
export function createSignedCookie(name: string, options: CookieOptions & { secrets: string[] }): Cookie {
  const { secrets, ...attributes } = options;
  if (secrets.length === 0) throw new Error("A signed cookie needs a secret.");
  const keys: KeyObject[] = secrets.map((secret) => createSecretKey(Buffer.from(secret, "utf8")));
  const plain = createCookie(name, attributes);
  const signatureOf = (value: string, key: KeyObject) =>
    createHmac("sha256", key).update(value, "utf8").digest("base64").replace(/=+$/, "");

  return {
    get name() {
      return plain.name;
    },
    get isSigned() {
      return true;
    },
    get expires() {
      return plain.expires;
    },
    async parse(cookieHeader) {
      if (!cookieHeader) return null;
      const raw = rawCookieValue(cookieHeader, name);
      if (raw === null) return null;
      if (raw === "") return "";
      const dot = raw.lastIndexOf(".");
      if (dot < 0) return null;
      const value = raw.slice(0, dot);
      const given = Buffer.from(raw.slice(dot + 1), "base64");
      for (const key of keys) {
        const expected = Buffer.from(signatureOf(value, key), "base64");
        if (given.length === expected.length && timingSafeEqual(given, expected)) return decodeValue(value);
      }
      return null;
    },
    async serialize(value, serializeOptions) {
      // The plain cookie writes the encoded value and every attribute; only the value gets its signature.
      const header = await plain.serialize(value, serializeOptions);
      if (value === "") return header;
      const separator = header.indexOf(";");
      const pair = separator < 0 ? header : header.slice(0, separator);
      const rest = separator < 0 ? "" : header.slice(separator);
      const encoded = decodeURIComponent(pair.slice(pair.indexOf("=") + 1));
      return `${name}=${encodeURIComponent(`${encoded}.${signatureOf(encoded, keys[0])}`)}${rest}`;
    },
  };
}

/** The first value named `name` in a Cookie header, undecoded past its URI escapes; null when absent. */
export function rawCookieValue(header: string, name: string): string | null {
  for (const part of header.split(";")) {
    const equals = part.indexOf("=");
    if (equals < 0) continue;
    if (part.slice(0, equals).trim() !== name) continue;
    let value = part.slice(equals + 1).trim();
    if (value.length >= 2 && value.startsWith('"') && value.endsWith('"')) value = value.slice(1, -1);
    try {
      return value.includes("%") ? decodeURIComponent(value) : value;
    } catch {
      return value;
    }
  }
  return null;
}

// React Router's encoding of a cookie value: JSON, URI-escaped, as Latin-1 bytes in base64.
function decodeValue(value: string): unknown {
  try {
    const bytes = Buffer.from(value, "base64").toString("latin1");
    return JSON.parse(decodeURIComponent(escape(bytes)));
  } catch {
    return {};
  }
}
