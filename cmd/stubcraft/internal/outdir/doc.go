// Package outdir writes a build's output directory so that nothing the
// user wrote is lost and no moment passes without a complete target.
//
// A build writes every file into a fresh temporary directory beside the
// target (".NAME.tmp-PID-RANDOM", PID the writing process), syncs each
// file, adds a manifest (ManifestName: every file's SHA-256, in the format
// sha256sum -c reads), syncs the directory and only then puts it in
// place. On Linux the new directory and an existing target are exchanged
// atomically (renameat2 with RENAME_EXCHANGE), so the target is at every
// moment either the old or the new complete build; the old one is then
// removed. Elsewhere, and on file systems without the exchange, the old
// directory stays where it is until the new one is complete and is moved
// aside only immediately before the new one moves in (a window of two
// renames). The parent directory is synced after the rename.
//
// An existing target is replaced only when the caller asks (Options.Force)
// and only when it is a directory this package wrote: it holds the
// manifest and nothing the manifest does not list, or it is empty. Files
// the manifest lists but that changed since are replaced (they are
// outputs) and named in a note. Anything else is refused with a list of
// what would be lost, and so is a target that holds one of the build's
// input files, and one that holds the current directory. A symbolic link
// as target is written through: the link stays and the directory it
// points to gets the new content. Parent directories that Open had to
// make are removed again when no build lands.
//
// Two builds to one target are kept apart by an advisory lock (flock on
// ".NAME.lock" beside the target) held from Open to Close: the second
// waits up to DefaultLockWait and then fails with the first one's process id.
// Holding the lock until after the caller has reported its output means no
// build reports files another has already replaced. Under the lock, Open
// removes temporary directories that processes no longer running left
// behind (a kill -9 mid-build), with a note.
package outdir
