#!/usr/bin/env node
// The command `tributary-check` (usage: tributary-check --help). The engine is TypeScript; tsx's
// module hooks load it, here and in the worker threads checkFile starts from this file.
import { register } from "tsx/esm/api";

register();
await import("../cli/entry.ts");
