"use client";
/** React access to the per-chain editor store. */
import { createContext, useContext, type ReactNode } from "react";
import { useStore } from "zustand";
import { useShallow } from "zustand/react/shallow";
import type { EditorActions, EditorState, EditorStore } from "./editor-store";

const EditorContext = createContext<EditorStore | null>(null);

export function EditorProvider({ store, children }: { store: EditorStore; children: ReactNode }) {
  return <EditorContext.Provider value={store}>{children}</EditorContext.Provider>;
}

export function useEditorStoreApi(): EditorStore {
  const store = useContext(EditorContext);
  if (!store) throw new Error("useEditor must be used inside <EditorProvider>");
  return store;
}

/** Subscribe to a slice of the editor state; re-renders only when the slice changes (by reference). */
export function useEditor<T>(selector: (s: EditorState) => T): T {
  return useStore(useEditorStoreApi(), selector);
}

/** Like useEditor, for selectors that build a new array or object each time (compared shallowly). */
export function useEditorShallow<T>(selector: (s: EditorState) => T): T {
  return useStore(useEditorStoreApi(), useShallow(selector));
}

export function useEditorActions(): EditorActions {
  return useStore(useEditorStoreApi(), (s) => s.actions);
}
