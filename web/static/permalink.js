// The list, options and the compare view's list B kept in the page address after "#". The fragment is
// never sent to a server. Format: "#z1=" + base64url(deflate-raw(JSON)) where
// the browser can compress, else "#v1=" + base64url(JSON).

function toBase64Url(bytes) {
  let bin = "";
  const step = 0x8000;
  for (let i = 0; i < bytes.length; i += step) bin += String.fromCharCode(...bytes.subarray(i, i + step));
  return btoa(bin).replace(/\+/g, "-").replace(/\//g, "_").replace(/=+$/, "");
}

function fromBase64Url(text) {
  if (!/^[A-Za-z0-9_-]*$/.test(text)) throw new Error("the link's list part has characters that do not belong there");
  const b64 = text.replace(/-/g, "+").replace(/_/g, "/") + "===".slice((text.length + 3) % 4);
  const bin = atob(b64);
  const out = new Uint8Array(bin.length);
  for (let i = 0; i < bin.length; i++) out[i] = bin.charCodeAt(i);
  return out;
}

async function through(stream, bytes) {
  const body = new Blob([bytes]).stream().pipeThrough(stream);
  return new Uint8Array(await new Response(body).arrayBuffer());
}

const canCompress = typeof CompressionStream === "function" && (() => {
  try {
    new CompressionStream("deflate-raw");
    return true;
  } catch {
    return false;
  }
})();

/** state: {text, options, b?} -> fragment without "#" (b: the compare view's list B, kept when not empty). */
export async function encodeState(state) {
  const data = { t: state.text, o: state.options };
  if (state.b) data.b = state.b;
  const json = new TextEncoder().encode(JSON.stringify(data));
  if (canCompress) return "z1=" + toBase64Url(await through(new CompressionStream("deflate-raw"), json));
  return "v1=" + toBase64Url(json);
}

/** Fragment (with or without "#") -> {text, options, b}, null when empty; throws on a bad link. */
export async function decodeState(fragment) {
  const f = String(fragment || "").replace(/^#/, "");
  if (!f) return null;
  const m = /^(z1|v1)=(.*)$/.exec(f);
  if (!m) return null; // some other anchor; not ours
  let bytes = fromBase64Url(m[2]);
  if (m[1] === "z1") {
    if (typeof DecompressionStream !== "function") throw new Error("this browser cannot read compressed links");
    try {
      bytes = await through(new DecompressionStream("deflate-raw"), bytes);
    } catch {
      throw new Error("the link's list part is damaged (it does not decompress)");
    }
  }
  let data;
  try {
    data = JSON.parse(new TextDecoder("utf-8", { fatal: true }).decode(bytes));
  } catch {
    throw new Error("the link's list part is damaged (it is not readable text)");
  }
  if (!data || typeof data.t !== "string") throw new Error("the link does not hold a list");
  const o = data.o && typeof data.o === "object" ? data.o : {};
  return {
    text: data.t,
    b: typeof data.b === "string" ? data.b : "",
    options: {
      on: typeof o.on === "string" ? o.on : "",
      from: typeof o.from === "string" ? o.from : "",
      to: typeof o.to === "string" ? o.to : "",
      billable: o.billable === true,
      mode: o.mode === "period" ? "period" : "on",
      // A system name, or "site:" and the name of a site's own index (its
      // manifest's file name); checked against the menu by the page.
      system:
        typeof o.system === "string" && /^(?:[a-z0-9]{2,12}|site:[A-Za-z0-9][A-Za-z0-9._-]{0,119})$/.test(o.system) ? o.system : "",
    },
  };
}
