/** Browser bundles: there are no files; read the text yourself and call parseFilmFile / filmFileText. */
import { InputError } from "../errors.js";
import type { FilmRecord, FilmToSave } from "./filmFile.js";

export function loadFilm(path: string): FilmRecord {
  throw new InputError("path", path, "a film file's text: in a browser call parseFilmFile(text) (loadFilm reads files in Node)");
}

export function saveFilm(_film: FilmToSave, path: string): string {
  throw new InputError("path", path, "no file in a browser: filmFileText(film) gives the text to save (saveFilm writes files in Node)");
}
