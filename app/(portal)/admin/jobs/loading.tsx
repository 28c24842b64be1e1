import { LoadingBlock } from "@/components/portal/loading-block";

export default function Loading() {
  return <LoadingBlock label="the checks" />;
}
