CMakeFiles/schrot_core.dir/src/base/err.c.o: /work/main/src/base/err.c \
 /usr/include/stdc-predef.h /work/main/include/schrot/err.h
