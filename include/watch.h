/* watch.h — rebuild when a file is saved.
 *
 * watch_loop() runs a build, then waits on inotify for a save of any file
 * the build read and runs it again, until SIGINT or SIGTERM. Editors save by
 * writing a new file and renaming it over the old one, so the loop watches
 * each file's directory (IN_CLOSE_WRITE, IN_MOVED_TO, IN_CREATE) and matches
 * the name, never the inode. Saves closer together than WATCH_DEBOUNCE_MS
 * give one build. Signals are taken through a signalfd, so a build is never
 * interrupted halfway: the loop returns between builds. */
#ifndef HEADROOM_WATCH_H
#define HEADROOM_WATCH_H

#include "arena.h"

enum { WATCH_DEBOUNCE_MS = 150 };

/* One build. It pushes onto `inputs` (heap strings, xstrdup) the paths of
 * every file it read: the calc and the files it uses. */
typedef void (*WatchBuild)(void *ctx, Vec *inputs);

/* Build, then rebuild on every save until a signal. Returns 0 on SIGINT or
 * SIGTERM, 3 when the files cannot be watched. */
int watch_loop(WatchBuild build, void *ctx);

#endif
