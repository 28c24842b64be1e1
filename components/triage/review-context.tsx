"use client";
/** What a reviewer writes on the batch page before deciding: comments per finding, shared by rows and bar. */
import { createContext, useContext, useState, type ReactNode } from "react";

type Review = {
  comments: Record<string, string>;
  setComment: (findingId: string, text: string) => void;
};

const ReviewContext = createContext<Review | null>(null);

export function ReviewProvider({ children }: { children: ReactNode }) {
  const [comments, setComments] = useState<Record<string, string>>({});
  const setComment = (findingId: string, text: string) => setComments((c) => ({ ...c, [findingId]: text }));
  return <ReviewContext.Provider value={{ comments, setComment }}>{children}</ReviewContext.Provider>;
}

/** Null outside a page where a decision can be made: the findings then have no comment field. */
export function useReview(): Review | null {
  return useContext(ReviewContext);
}

/** The comment field on a finding's own row, sent with the decision. */
export function FindingComment({ id, code, label }: { id: string; code: string; label: string }) {
  const review = useReview();
  if (!review) return null;
  return (
    <textarea
      id={`fc-${id}`}
      aria-label={`Comment on ${label}`}
      data-finding-code={code}
      placeholder="Comment to the provider"
      className="w-full rounded border border-silt bg-white px-2 py-1 text-sm focus:outline-2 focus:outline-channel"
      rows={1}
      maxLength={2000}
      value={review.comments[id] ?? ""}
      onChange={(e) => review.setComment(id, e.target.value)}
      onKeyDown={(e) => e.stopPropagation()}
    />
  );
}
