/* Module skeleton: filled in by the scan kernel work. */
#define PY_SSIZE_T_CLEAN
#include <Python.h>

static struct PyModuleDef module = {PyModuleDef_HEAD_INIT, "_scan_c", NULL, -1, NULL};

PyMODINIT_FUNC PyInit__scan_c(void) { return PyModule_Create(&module); }
