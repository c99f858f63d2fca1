/* fw-test-render.h: shared by the tests in tests/render (include once per test program).
 *
 * LeakSanitizer: fontconfig (used by Pango for every label) keeps its configuration and font
 * caches for the life of the process and never frees them; in the -Db_sanitize=address build
 * those allocations would be reported as leaks at exit. This is the sanitizer's documented
 * hook for built-in suppressions; it is never called in other builds.
 */
#pragma once

const char *__lsan_default_suppressions (void);

const char *
__lsan_default_suppressions (void)
{
  return "leak:libfontconfig.so\n";
}
