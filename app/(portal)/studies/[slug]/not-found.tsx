import Link from "next/link";

export default function StudyNotFound() {
  return (
    <div className="max-w-2xl">
      <h1 className="text-2xl font-semibold">Study not found</h1>
      <p className="mt-2 text-base">
        There is no study at this address that you can see. Your organisation may not be admitted to it, or
        you may not be assigned to it.{" "}
        <Link href="/studies" className="text-channel underline">
          See your studies
        </Link>
        .
      </p>
    </div>
  );
}
