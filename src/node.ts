// domtopo/node: everything of the library entry plus the Node-only pieces (files, workers).
export * from "./index";
