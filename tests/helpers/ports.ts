import net from "node:net";

/** A TCP port on 127.0.0.1 that nothing listens on at the moment of the call. */
export async function sparePort(): Promise<number> {
  const s = net.createServer();
  await new Promise<void>((resolve) => s.listen(0, "127.0.0.1", () => resolve()));
  const { port } = s.address() as net.AddressInfo;
  await new Promise<void>((resolve) => s.close(() => resolve()));
  return port;
}
