// Typed, validated reads from a parsed form body. Every failure names the offending
// parameter in Stripe's bracket notation, so callers see exactly what to fix.
import { invalidParam, missingParam } from "./errors";
import type { FormObject, FormValue } from "./form";

const INTEGER = /^-?\d+$/;

export class Params {
  private readonly data: FormObject;
  private readonly prefix: string;

  constructor(data: FormObject, prefix = "") {
    this.data = data;
    this.prefix = prefix;
  }

  path(key: string): string {
    return this.prefix === "" ? key : `${this.prefix}[${key}]`;
  }

  has(key: string): boolean {
    return this.data[key] !== undefined && this.data[key] !== "";
  }

  /** Refuses parameters this fake does not model, instead of silently ignoring them. */
  rejectUnknown(allowed: readonly string[]): void {
    for (const key of Object.keys(this.data)) {
      if (!allowed.includes(key)) {
        throw invalidParam(
          this.path(key),
          `Received unknown parameter: ${this.path(key)}. The local payments fake supports: ${allowed.join(", ")}.`,
          "parameter_unknown",
        );
      }
    }
  }

  private scalar(key: string): string | undefined {
    const value: FormValue | undefined = this.data[key];
    if (value === undefined || value === "") return undefined;
    if (typeof value !== "string") throw invalidParam(this.path(key), `Invalid ${this.path(key)}: expected a single value, not a nested one.`);
    return value;
  }

  optionalString(key: string, maxLength = 5000): string | undefined {
    const value = this.scalar(key);
    if (value !== undefined && value.length > maxLength) {
      throw invalidParam(this.path(key), `Invalid ${this.path(key)}: must be at most ${maxLength} characters long.`, "string_length");
    }
    return value;
  }

  requiredString(key: string, maxLength = 5000): string {
    const value = this.optionalString(key, maxLength);
    if (value === undefined) throw missingParam(this.path(key));
    return value;
  }

  optionalInteger(key: string, range: { min: number; max: number }): number | undefined {
    const raw = this.scalar(key);
    if (raw === undefined) return undefined;
    if (!INTEGER.test(raw)) throw invalidParam(this.path(key), `Invalid integer: ${raw}`, "parameter_invalid_integer");
    const value = Number(raw);
    if (value < range.min) {
      throw invalidParam(this.path(key), `Invalid ${this.path(key)}: must be at least ${range.min}.`, "parameter_invalid_integer");
    }
    if (value > range.max) {
      throw invalidParam(this.path(key), `Invalid ${this.path(key)}: must be at most ${range.max}.`, "parameter_invalid_integer");
    }
    return value;
  }

  requiredInteger(key: string, range: { min: number; max: number }): number {
    const value = this.optionalInteger(key, range);
    if (value === undefined) throw missingParam(this.path(key));
    return value;
  }

  optionalEnum<T extends string>(key: string, values: readonly T[]): T | undefined {
    const value = this.scalar(key);
    if (value === undefined) return undefined;
    if (!(values as readonly string[]).includes(value)) {
      throw invalidParam(this.path(key), `Invalid ${this.path(key)}: must be one of ${values.join(", ")}.`);
    }
    return value as T;
  }

  optionalUrl(key: string): string | undefined {
    const value = this.optionalString(key, 5000);
    if (value === undefined) return undefined;
    let parsed: URL;
    try {
      parsed = new URL(value.replaceAll("{CHECKOUT_SESSION_ID}", "placeholder"));
    } catch {
      throw invalidParam(this.path(key), `Not a valid URL: ${this.path(key)}`, "url_invalid");
    }
    if (parsed.protocol !== "http:" && parsed.protocol !== "https:") {
      throw invalidParam(this.path(key), `Not a valid URL: ${this.path(key)} must use http or https`, "url_invalid");
    }
    return value;
  }

  optionalObject(key: string): Params | undefined {
    const value = this.data[key];
    if (value === undefined || value === "") return undefined;
    if (typeof value === "string" || Array.isArray(value)) {
      throw invalidParam(this.path(key), `Invalid ${this.path(key)}: expected a hash, as in ${this.path(key)}[name]=value.`);
    }
    return new Params(value, this.path(key));
  }

  requiredObject(key: string): Params {
    const value = this.optionalObject(key);
    if (value === undefined) throw missingParam(this.path(key));
    return value;
  }

  requiredObjectArray(key: string): Params[] {
    const value = this.data[key];
    if (value === undefined || value === "") throw missingParam(this.path(key));
    if (!Array.isArray(value)) {
      throw invalidParam(this.path(key), `Invalid array: ${this.path(key)} must be sent as ${this.path(key)}[0][...], ${this.path(key)}[1][...].`);
    }
    return value.map((element, index) => {
      const elementPath = `${this.path(key)}[${index}]`;
      if (typeof element === "string" || Array.isArray(element)) {
        throw invalidParam(elementPath, `Invalid ${elementPath}: expected a hash.`);
      }
      return new Params(element, elementPath);
    });
  }

  optionalStringArray(key: string): string[] {
    const value = this.data[key];
    if (value === undefined || value === "") return [];
    const list = typeof value === "string" ? [value] : value;
    if (!Array.isArray(list) || !list.every((item): item is string => typeof item === "string")) {
      throw invalidParam(this.path(key), `Invalid ${this.path(key)}: expected a list of strings, as in ${this.path(key)}[0]=a.`);
    }
    return list;
  }

  /** Stripe's metadata limits: 50 keys, key up to 40 characters, value up to 500. */
  metadata(key = "metadata"): Record<string, string> {
    const value = this.data[key];
    if (value === undefined || value === "") return {};
    if (typeof value === "string" || Array.isArray(value)) {
      throw invalidParam(this.path(key), `Invalid ${this.path(key)}: expected a hash, as in ${this.path(key)}[name]=value.`);
    }
    const result: Record<string, string> = {};
    for (const [name, entry] of Object.entries(value)) {
      const entryPath = `${this.path(key)}[${name}]`;
      if (typeof entry !== "string") throw invalidParam(entryPath, `Invalid ${entryPath}: metadata values must be strings.`);
      if (name.length > 40) throw invalidParam(entryPath, `Invalid ${entryPath}: metadata keys must be at most 40 characters.`);
      if (entry.length > 500) throw invalidParam(entryPath, `Invalid ${entryPath}: metadata values must be at most 500 characters.`);
      // An empty value unsets a key in Stripe; on creation that simply means "absent".
      if (entry !== "") result[name] = entry;
    }
    if (Object.keys(result).length > 50) throw invalidParam(this.path(key), `Invalid ${this.path(key)}: at most 50 keys.`);
    return result;
  }
}
