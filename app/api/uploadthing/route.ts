/** The upload SDK's route: configuration, upload requests and the service's callbacks. */
import { createRouteHandler } from "uploadthing/next";
import { batchFileRouter } from "@/lib/batches/intake/upload-router";

export const dynamic = "force-dynamic";

export const { GET, POST } = createRouteHandler({ router: batchFileRouter });
