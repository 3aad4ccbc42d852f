import fs from "node:fs";
import path from "node:path";

// Memory of the e2e server, read from /proc (Linux). scripts/test.sh records the pid of `next start` in
// .data/test-next.pid; the process that answers may be that one or a child it started, so the one holding
// the listening socket of the test port is the one measured.

function listeningInodes(port: number): Set<string> {
  const inodes = new Set<string>();
  for (const table of ["/proc/net/tcp", "/proc/net/tcp6"]) {
    if (!fs.existsSync(table)) continue;
    for (const line of fs.readFileSync(table, "utf8").split("\n").slice(1)) {
      const cols = line.trim().split(/\s+/);
      // local_address is HEX_IP:HEX_PORT; state 0A is LISTEN; column 9 is the socket's inode.
      if (cols.length > 9 && cols[3] === "0A" && parseInt(cols[1]!.split(":")[1]!, 16) === port) inodes.add(cols[9]!);
    }
  }
  return inodes;
}

function withDescendants(root: number): number[] {
  const children = new Map<number, number[]>();
  for (const entry of fs.readdirSync("/proc")) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      const stat = fs.readFileSync(`/proc/${entry}/stat`, "utf8");
      const ppid = Number(stat.slice(stat.lastIndexOf(")") + 2).split(" ")[1]);
      children.set(ppid, [...(children.get(ppid) ?? []), Number(entry)]);
    } catch {
      // The process ended while we looked.
    }
  }
  const all = [root];
  for (let i = 0; i < all.length; i++) all.push(...(children.get(all[i]!) ?? []));
  return all;
}

/** The pid of the process that accepts connections on the e2e server's port. */
export function servingProcess(): number {
  const root = Number(fs.readFileSync(path.resolve(".data/test-next.pid"), "utf8").trim());
  const port = Number(new URL(process.env.E2E_BASE_URL!).port);
  const inodes = listeningInodes(port);
  for (const pid of withDescendants(root)) {
    let fds: string[] = [];
    try {
      fds = fs.readdirSync(`/proc/${pid}/fd`);
    } catch {
      continue;
    }
    for (const fd of fds) {
      try {
        const target = fs.readlinkSync(`/proc/${pid}/fd/${fd}`);
        if (inodes.has(/^socket:\[(\d+)\]$/.exec(target)?.[1] ?? "")) return pid;
      } catch {
        // The descriptor closed while we looked.
      }
    }
  }
  throw new Error(`no process under pid ${root} listens on port ${port}`);
}

function statusKb(pid: number, field: "VmRSS" | "VmHWM"): number {
  const line = fs.readFileSync(`/proc/${pid}/status`, "utf8").split("\n").find((l) => l.startsWith(`${field}:`));
  if (!line) throw new Error(`no ${field} for pid ${pid}`);
  return Number(line.split(/\s+/)[1]);
}

/** Resident memory now, in bytes, after setting the process's peak back to it (Linux clear_refs 5). */
export function startPeakMemory(pid: number): number {
  fs.writeFileSync(`/proc/${pid}/clear_refs`, "5");
  return statusKb(pid, "VmRSS") * 1024;
}

/** The highest resident memory since startPeakMemory, in bytes. */
export function peakMemory(pid: number): number {
  return statusKb(pid, "VmHWM") * 1024;
}
