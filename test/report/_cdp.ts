/**
 * A small driver for headless Chromium over the DevTools protocol, with
 * Deno's built-in WebSocket (no browser download, no extra dependency).
 *
 * @module
 */

import { existsSync, mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";

/** Where Debian's `chromium` package puts the browser. */
export const CHROMIUM = "/usr/bin/chromium";

/** True when the browser is installed. */
export function hasChromium(): boolean {
  return existsSync(CHROMIUM);
}

type Json = Record<string, unknown>;

/** What a page did while it loaded. */
export interface PageLog {
  errors: string[];
  requests: string[];
}

/** A running browser with one page attached. */
export interface BrowserPage {
  send(method: string, params?: Json): Promise<Json>;
  log: PageLog;
  close(): Promise<void>;
}

/** Launches Chromium headless and attaches to a fresh page. */
export async function openBrowser(): Promise<BrowserPage> {
  const profile = mkdtempSync(join(tmpdir(), "hotfield-chromium-"));
  const child = new Deno.Command(CHROMIUM, {
    args: [
      "--headless",
      "--no-sandbox",
      "--disable-gpu",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
      "--no-first-run",
      "--no-default-browser-check",
      "--disable-dev-shm-usage",
      "--hide-scrollbars",
      "--force-device-scale-factor=1",
      `--user-data-dir=${profile}`,
      "--remote-debugging-port=0",
      "about:blank",
    ],
    stdout: "null",
    stderr: "piped",
  }).spawn();

  // The browser prints its endpoint on stderr: "DevTools listening on ws://...".
  const reader = child.stderr.pipeThrough(new TextDecoderStream()).getReader();
  let buffered = "";
  const wsUrl = await new Promise<string>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error("Chromium did not start in 30 s")), 30000);
    (async () => {
      while (true) {
        const { value, done } = await reader.read();
        if (done) {
          clearTimeout(timer);
          reject(new Error(`Chromium exited before listening: ${buffered.slice(-500)}`));
          return;
        }
        buffered += value;
        const m = buffered.match(/DevTools listening on (ws:\/\/\S+)/);
        if (m) {
          clearTimeout(timer);
          resolve(m[1]);
          return;
        }
      }
    })().catch(reject);
  });
  // Keep draining stderr so the browser never blocks on a full pipe.
  const drain = (async () => {
    try {
      while (!(await reader.read()).done) { /* discard */ }
    } catch { /* closed */ }
  })();

  const ws = new WebSocket(wsUrl);
  await new Promise<void>((resolve, reject) => {
    ws.onopen = () => resolve();
    ws.onerror = () => reject(new Error(`Cannot connect to ${wsUrl}`));
  });
  let nextId = 1;
  const pending = new Map<number, { resolve: (v: Json) => void; reject: (e: Error) => void }>();
  const log: PageLog = { errors: [], requests: [] };
  ws.onmessage = (ev) => {
    const msg = JSON.parse(String(ev.data));
    if (typeof msg.id === "number") {
      const p = pending.get(msg.id);
      pending.delete(msg.id);
      if (!p) return;
      if (msg.error) p.reject(new Error(`${msg.error.message} (${msg.error.code})`));
      else p.resolve(msg.result ?? {});
      return;
    }
    const params = msg.params ?? {};
    switch (msg.method) {
      case "Runtime.consoleAPICalled":
        if (params.type === "error" || params.type === "assert") {
          log.errors.push(
            "console: " + (params.args ?? []).map((a: Json) => a.value ?? a.description).join(" "),
          );
        }
        break;
      case "Runtime.exceptionThrown":
        log.errors.push(
          "exception: " + (params.exceptionDetails?.exception?.description ??
            params.exceptionDetails?.text),
        );
        break;
      case "Log.entryAdded":
        if (params.entry?.level === "error") log.errors.push("log: " + params.entry.text);
        break;
      case "Network.requestWillBeSent":
        log.requests.push(params.request?.url ?? "");
        break;
    }
  };
  const raw = (method: string, params: Json = {}, session?: string) =>
    new Promise<Json>((resolve, reject) => {
      const id = nextId++;
      pending.set(id, { resolve, reject });
      ws.send(JSON.stringify({ id, method, params, ...(session ? { sessionId: session } : {}) }));
    });
  const { targetId } = await raw("Target.createTarget", { url: "about:blank" });
  const attached = await raw("Target.attachToTarget", { targetId, flatten: true });
  const sessionId = attached.sessionId as string;
  const send = (method: string, params: Json = {}) => raw(method, params, sessionId);
  await send("Page.enable");
  await send("Runtime.enable");
  await send("Log.enable");
  await send("Network.enable");

  return {
    send,
    log,
    async close() {
      try {
        await raw("Browser.close");
      } catch { /* already gone */ }
      ws.close();
      try {
        await Promise.race([child.status, new Promise((r) => setTimeout(r, 5000))]);
        child.kill("SIGKILL");
      } catch { /* exited */ }
      await child.status;
      await drain;
      rmSync(profile, { recursive: true, force: true });
    },
  };
}

/** Evaluates an expression in the page and returns its value. */
export async function evaluate(page: BrowserPage, expression: string): Promise<unknown> {
  const r = await page.send("Runtime.evaluate", { expression, returnByValue: true });
  return (r.result as Json | undefined)?.value;
}

/** Polls `expression` until it is truthy or `timeoutMs` passes. */
export async function waitFor(
  page: BrowserPage,
  expression: string,
  timeoutMs = 30000,
): Promise<unknown> {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    const v = await evaluate(page, expression);
    if (v) return v;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`Timed out waiting for ${expression}`);
}
