import Link from "next/link";

export default function PoolNotFound() {
  return (
    <div className="max-w-2xl">
      <h1 className="text-2xl font-semibold">Pool not found</h1>
      <p className="mt-2 text-base">
        There is no study at this address whose pool you can see. Analysts see the pools of the studies they
        are assigned to.{" "}
        <Link href="/pool" className="text-channel underline">
          See the pools you can open
        </Link>
        .
      </p>
    </div>
  );
}
