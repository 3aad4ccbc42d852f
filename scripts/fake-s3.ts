// A local fake S3 object store (s3rver, from npm) on loopback, for the demo (scripts/up.sh) and the tests
// (scripts/test.sh): the app reaches it through the same S3 client and settings as a real bucket
// (STORAGE_DRIVER=s3, S3_ENDPOINT, S3_BUCKET, keys S3RVER/S3RVER). Objects are files under S3_DIR.
import S3rver from "s3rver";
import path from "node:path";

const port = Number(process.env.S3_PORT ?? 4569);
const directory = path.resolve(process.env.S3_DIR ?? ".data/s3");
const bucket = process.env.S3_BUCKET || "seedplot";

export async function startFakeS3(options: { port: number; directory: string; bucket: string }) {
  const server = new S3rver({ address: "127.0.0.1", port: options.port, silent: true, directory: options.directory, configureBuckets: [{ name: options.bucket }] });
  await server.run();
  return server;
}

if (process.argv[1]?.endsWith("fake-s3.ts")) {
  startFakeS3({ port, directory, bucket })
    .then(() => console.log(`[seedplot] fake S3 store on 127.0.0.1:${port}, bucket ${bucket}, files in ${directory}`))
    .catch((e: Error) => {
      console.error(`[seedplot] fake S3 store could not start: ${e.message}`);
      process.exit(1);
    });
}
