import { LoadingBlock } from "@/src/ui/loading-block";

export default function Loading() {
  return <LoadingBlock />;
}
