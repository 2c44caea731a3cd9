import { createReadStream } from "node:fs";
import { copyFile, mkdir, readdir, rename, rm, stat } from "node:fs/promises";
import path from "node:path";
import { ObjectNotFoundError, type ObjectStore } from "./types";

/**
 * Objects as files under one folder, for a single server or a shared volume. A file
 * appears under its key only when complete (copied to a temporary name, then renamed).
 */
export class LocalObjectStore implements ObjectStore {
  readonly kind = "local" as const;

  constructor(private readonly root: string) {}

  private pathOf(key: string): string {
    // Keys come from the app, never from users; refuse anything that could climb out anyway.
    if (!/^[A-Za-z0-9_-]+(?:\/[A-Za-z0-9_.-]+)*$/.test(key) || key.split("/").some((part) => part === "." || part === "..")) {
      throw new Error(`Refusing storage key "${key}".`);
    }
    return path.join(this.root, ...key.split("/"));
  }

  async put(key: string, filePath: string, _size: number, _contentType: string): Promise<void> {
    const target = this.pathOf(key);
    await mkdir(path.dirname(target), { recursive: true });
    const partial = `${target}.part-${process.pid}-${Date.now()}`;
    try {
      await copyFile(filePath, partial);
      await rename(partial, target);
    } catch (error) {
      await rm(partial, { force: true });
      throw error;
    }
  }

  async get(key: string): Promise<{ body: ReturnType<typeof createReadStream>; size: number }> {
    const target = this.pathOf(key);
    try {
      const { size } = await stat(target);
      return { body: createReadStream(target), size };
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code === "ENOENT") throw new ObjectNotFoundError(key);
      throw error;
    }
  }

  async delete(key: string): Promise<void> {
    await rm(this.pathOf(key), { force: true });
  }

  async list(prefix: string): Promise<string[]> {
    const keys: string[] = [];
    const walk = async (folder: string, keyPrefix: string) => {
      let entries;
      try {
        entries = await readdir(folder, { withFileTypes: true });
      } catch (error) {
        if ((error as NodeJS.ErrnoException).code === "ENOENT") return;
        throw error;
      }
      for (const entry of entries) {
        const key = keyPrefix ? `${keyPrefix}/${entry.name}` : entry.name;
        if (entry.isDirectory()) await walk(path.join(folder, entry.name), key);
        else if (!entry.name.includes(".part-")) keys.push(key);
      }
    };
    await walk(this.root, "");
    return keys.filter((key) => key.startsWith(prefix)).sort();
  }
}
