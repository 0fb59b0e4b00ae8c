import { spawnSync } from "node:child_process";
import { existsSync, lstatSync, readFileSync, symlinkSync, writeFileSync } from "node:fs";
import { hostname } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { acquireRunLock, completePendingFileSets, outputTarget, pathKey, removeStalePartials, writeFileAtomic, writeFileSet, writeFileSynced } from "@chirpsieve/core";
import { commitRecordPath } from "../../packages/core/src/io/fileSet.js";
import { useTempDir } from "./tempDir.js";

const tmp = useTempDir("file-safety");

function deadPid(): number {
  return Number(spawnSync(process.execPath, ["-e", "process.stdout.write(String(process.pid))"], { encoding: "utf8" }).stdout);
}

describe("file identity and output targets", () => {
  it("a link and its target have one key; a new file's key is its real directory and name", () => {
    writeFileSync(tmp.path("a.txt"), "a");
    symlinkSync("a.txt", tmp.path("a-link.txt"));
    expect(pathKey(tmp.path("a-link.txt"))).toBe(pathKey(tmp.path("a.txt")));
    expect(pathKey(tmp.path("new.txt"))).toBe(pathKey(join(tmp.dir, ".", "new.txt")));
    expect(pathKey(tmp.path("new.txt"))).not.toBe(pathKey(tmp.path("a.txt")));
  });

  it("writes through a link, refuses devices and directories", () => {
    writeFileSync(tmp.path("t.txt"), "old");
    symlinkSync("t.txt", tmp.path("t-link.txt"));
    expect(outputTarget(tmp.path("t-link.txt"))).toBe(tmp.path("t.txt"));
    writeFileAtomic(tmp.path("t-link.txt"), "new");
    expect(lstatSync(tmp.path("t-link.txt")).isSymbolicLink()).toBe(true);
    expect(readFileSync(tmp.path("t.txt"), "utf8")).toBe("new");
    expect(() => outputTarget("/dev/null")).toThrow(/a device or system file/);
    expect(() => outputTarget(tmp.dir)).toThrow(/is a directory/);
  });
});

describe("stale temporary files", () => {
  it("removes a dead writer's, keeps a live writer's and those a pending set commit lists", () => {
    const out = tmp.path("o.jsonl");
    const dead = `.o.jsonl.${deadPid()}.1-0.partial`;
    const live = `.o.jsonl.${process.pid}.1-0.partial`;
    const listed = `.o.jsonl.${deadPid()}.2-0.partial`;
    for (const f of [dead, live, listed]) writeFileSync(tmp.path(f), "x");
    writeFileSync(commitRecordPath(tmp.path("set")), JSON.stringify({ type: "chirpsieve-file-set", format: 1, members: [{ staged: tmp.path(listed), final: out }] }));
    expect(removeStalePartials(out)).toEqual([dead]);
    expect(existsSync(tmp.path(live)) && existsSync(tmp.path(listed))).toBe(true);
    // A reader of the set completes it: the listed file becomes the output, the record goes.
    expect(completePendingFileSets([out])).toEqual([commitRecordPath(tmp.path("set"))]);
    expect(readFileSync(out, "utf8")).toBe("x");
    expect(existsSync(tmp.path(listed))).toBe(false);
  });
});

describe("file sets", () => {
  it("writes every member, then removes its commit record; a failing stage leaves the old files and no temporary file", async () => {
    const [a, b] = [tmp.path("s1.txt"), tmp.path("s2.txt")];
    await writeFileSet(a, (staged) => {
      writeFileSynced(staged(a), "A1");
      writeFileSynced(staged(b), "B1");
    });
    expect([readFileSync(a, "utf8"), readFileSync(b, "utf8")]).toEqual(["A1", "B1"]);
    await expect(
      writeFileSet(a, (staged) => {
        writeFileSynced(staged(a), "A2");
        throw new Error("disk full");
      }),
    ).rejects.toThrow(/disk full/);
    expect([readFileSync(a, "utf8"), readFileSync(b, "utf8")]).toEqual(["A1", "B1"]);
    expect(tmp.files().filter((f) => f.startsWith(".s1.txt") || f.startsWith(".s2.txt"))).toEqual([]);
  });
});

describe("run locks", () => {
  it("refuses a live holder, takes over a dead one's lock, releases its own", () => {
    const path = tmp.path("run.lock");
    const held = acquireRunLock(path, "the state");
    expect(() => acquireRunLock(path, "the state")).toThrow(/^the state: in use by a running process \d+ \(lock .*run\.lock\)/);
    held.release();
    expect(existsSync(path)).toBe(false);
    const owner = { pid: deadPid(), started: null, host: hostname() };
    writeFileSync(path, JSON.stringify(owner));
    const taken = acquireRunLock(path, "the state");
    expect(JSON.parse(readFileSync(path, "utf8")).pid).toBe(process.pid);
    taken.release();
    writeFileSync(path, JSON.stringify({ pid: process.pid, started: null, host: "elsewhere" }));
    expect(() => acquireRunLock(path, "the state")).toThrow(/in use by process \d+ on elsewhere .*delete the lock/);
  });
});
