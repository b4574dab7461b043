'use client';
import { useEffect } from 'react';

/**
 * Marks the document once React has hydrated it (`<html data-hydrated>`): end-to-end tests wait for
 * it after a full page load, so nothing is typed or pressed before the page's handlers exist.
 */
export function HydrationMark() {
  useEffect(() => {
    document.documentElement.dataset.hydrated = 'true';
  }, []);
  return null;
}
