// The program of the HDF5 worker thread (internal; see hdf5Client.ts). It is kept as plain
// JavaScript source so that it runs the same from the built package and from the TypeScript
// sources under the test runner; it is started with `new Worker(source, { eval: true })`.
//
// The worker owns one h5wasm instance and the files it opened. It captures what the HDF5
// library prints on stderr (fd 2) or through console, so nothing reaches the user's terminal,
// and turns an HDF5 error stack into the reason of a failed request: h5wasm often reports a
// failure only that way, returning an empty or partial answer. Requests:
//   open {path}                          -> {handle, datasets:[{path,type,size,signed,shape}], groups}
//   attrs {handle, object, names}        -> {present:[names], values:{name: value}}  (object "" = root)
//   read {handle, dataset, offset, count} -> Float32Array | Float64Array (buffer transferred)
//   close {handle}                       -> null
//   write {path, segments, data, numberAttrs, stringAttrs} -> null
// A reply is {id, ok: true, value} or {id, ok: false, kind: "hdf5" | "trap", reason}.

/** JavaScript source of the worker (CommonJS, run with eval). No template literals inside. */
export const HDF5_WORKER_SOURCE = String.raw`
"use strict";
const { parentPort, workerData } = require("node:worker_threads");
const fs = require("node:fs");
let diagnostics = "";
const originalWriteSync = fs.writeSync;
fs.writeSync = function (fd, buffer, a, b) {
  if (fd !== 2) return originalWriteSync.apply(fs, arguments);
  if (typeof buffer === "string") { diagnostics += buffer; return Buffer.byteLength(buffer); }
  const offset = typeof a === "number" ? a : 0;
  const length = typeof b === "number" ? b : buffer.byteLength - offset;
  diagnostics += Buffer.from(buffer.buffer, buffer.byteOffset + offset, length).toString("utf8");
  return length;
};
// The library's own warnings go through console (bound when it loads, so replace first).
for (const name of ["log", "info", "warn", "error", "debug"]) {
  console[name] = function () { diagnostics += Array.prototype.join.call(arguments, " ") + "\n"; };
}
function hasDiagnostics() { return /#\d+:/.test(diagnostics) || diagnostics.indexOf("HDF5-DIAG") >= 0; }
function reasonFrom(thrown) {
  const frames = [];
  const re = /#\d+:[^\n]*?\(\): ([^\n]*)/g;
  let m;
  while ((m = re.exec(diagnostics)) !== null) frames.push(m[1].trim());
  let reason = frames.length > 0 ? frames[frames.length - 1] : "";
  if (reason === "" && thrown !== undefined) reason = thrown instanceof Error ? thrown.message : String(thrown);
  reason = reason.replace(/\s+/g, " ").trim();
  if (reason === "") reason = "unknown HDF5 error";
  return reason.length > 160 ? reason.slice(0, 157) + "..." : reason;
}
function isTrap(e) {
  return e !== null && typeof e === "object" && (e.name === "RuntimeError" || (typeof e.message === "string" && e.message.indexOf("Aborted(") === 0));
}
function plain(v) {
  if (typeof v === "bigint") return Number(v);
  if (v instanceof BigInt64Array || v instanceof BigUint64Array) return Array.from(v, Number);
  if (ArrayBuffer.isView(v)) return Array.from(v);
  if (Array.isArray(v)) return v.map(plain);
  if (v === null || typeof v === "number" || typeof v === "string" || typeof v === "boolean") return v;
  return String(v);
}
(async () => {
  const h5 = (await import(workerData.h5url)).default;
  await h5.ready;
  const files = new Map();
  let nextHandle = 1;
  function fileOf(handle) {
    const f = files.get(handle);
    if (f === undefined) throw new Error("unknown file handle");
    return f;
  }
  const ops = {
    open(args) {
      const f = new h5.File(args.path, "r");
      if (f.file_id < 0n) throw new Error("the library could not open it");
      try {
        const datasets = [];
        const groups = [];
        for (const p of f.paths()) {
          const e = f.get(p);
          if (e instanceof h5.Dataset) {
            const m = e.metadata;
            datasets.push({ path: p, type: m.type, size: m.size, signed: m.signed, shape: m.shape });
          } else if (e instanceof h5.Group) {
            groups.push(p);
          }
        }
        if (hasDiagnostics()) throw new Error(reasonFrom(undefined));
        const handle = nextHandle++;
        files.set(handle, { file: f, datasets: new Map() });
        return { value: { handle, datasets, groups } };
      } catch (e) {
        try { f.close(); } catch (ignored) { /* closing a damaged file may fail too */ }
        throw e;
      }
    },
    attrs(args) {
      const entry = fileOf(args.handle);
      const obj = args.object === "" ? entry.file : entry.file.get(args.object);
      if (obj === null || obj === undefined) throw new Error("no object " + args.object);
      const attrs = obj.attrs;
      const present = Object.keys(attrs);
      const values = {};
      for (const name of args.names) if (present.indexOf(name) >= 0) values[name] = plain(attrs[name].value);
      return { value: { present, values } };
    },
    read(args) {
      const entry = fileOf(args.handle);
      let ds = entry.datasets.get(args.dataset);
      if (ds === undefined) {
        ds = entry.file.get(args.dataset);
        if (!(ds instanceof h5.Dataset)) throw new Error("no dataset " + args.dataset);
        entry.datasets.set(args.dataset, ds);
      }
      const out = ds.slice([[args.offset, args.offset + args.count]]);
      return { value: out, transfer: ArrayBuffer.isView(out) ? [out.buffer] : [] };
    },
    close(args) {
      const entry = files.get(args.handle);
      if (entry !== undefined) {
        files.delete(args.handle);
        entry.file.close();
      }
      return { value: null };
    },
    write(args) {
      const f = new h5.File(args.path, "w");
      try {
        let g = f;
        for (const s of args.segments.slice(0, -1)) g = g.create_group(s);
        const ds = g.create_dataset({ name: args.segments[args.segments.length - 1], data: args.data });
        // h5wasm dtype strings are struct codes: "<d" is a little-endian 8-byte float.
        for (const [k, v] of args.numberAttrs) ds.create_attribute(k, v, [], "<d");
        for (const [k, v] of args.stringAttrs) ds.create_attribute(k, v);
      } finally {
        f.close();
      }
      return { value: null };
    },
  };
  parentPort.on("message", (msg) => {
    diagnostics = "";
    let reply;
    let transfer = [];
    try {
      const op = ops[msg.op];
      if (op === undefined) throw new Error("unknown request " + msg.op);
      const result = op(msg.args);
      if (hasDiagnostics()) reply = { id: msg.id, ok: false, kind: "hdf5", reason: reasonFrom(undefined) };
      else {
        reply = { id: msg.id, ok: true, value: result.value };
        transfer = result.transfer || [];
      }
    } catch (e) {
      reply = { id: msg.id, ok: false, kind: isTrap(e) ? "trap" : "hdf5", reason: reasonFrom(e) };
    }
    parentPort.postMessage(reply, transfer);
  });
  parentPort.postMessage({ ready: true });
})().catch((e) => {
  parentPort.postMessage({ fatal: e instanceof Error ? e.message : String(e) });
});
`;
