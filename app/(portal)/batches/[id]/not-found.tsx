import Link from "next/link";

export default function BatchNotFound() {
  return (
    <div className="max-w-2xl">
      <h1 className="text-2xl font-semibold">Batch not found</h1>
      <p className="mt-2 text-base">
        There is no batch at this address that you can see. It may belong to another organisation or to a
        study you are not assigned to.{" "}
        <Link href="/" className="text-channel underline">
          Go to your home page
        </Link>
        .
      </p>
    </div>
  );
}
