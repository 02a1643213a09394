module pasval

go 1.26
