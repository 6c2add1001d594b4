"use client";
import { useLayoutEffect, useRef, type RefObject } from "react";

/**
 * A ref that always holds the latest value, for callbacks that must read it without being re-created
 * (it is updated after render, before any event handler can run).
 */
export function useLatest<T>(value: T): RefObject<T> {
  const ref = useRef(value);
  useLayoutEffect(() => {
    ref.current = value;
  });
  return ref;
}
