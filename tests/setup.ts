import { vi } from "vitest";

// `server-only` throws outside a React server bundle; tests import db/ and lib/ code directly.
vi.mock("server-only", () => ({}));
