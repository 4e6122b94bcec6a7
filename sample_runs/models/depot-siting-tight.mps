NAME depot-siting-tight
ROWS
 N  obj
 E  served[Ashby_Wold]
 E  served[Brackenmere]
 E  served[Coldharbour_Edge]
 E  served[Dunmoss]
 E  served[Eelbrook]
 E  served[Fennick_Cross]
 E  served[Gorsedale]
 E  served[Hollins_Tarn]
 E  served[Inkpen_Vale]
 E  served[Juniper_Lees]
 E  served[Kestle_Moor]
 E  served[Larkspur_Ford]
 E  served[Mossgrave]
 E  served[Nettlecombe]
 E  served[Orrin_Falls]
 E  served[Pennyfold]
 E  served[Quillsby]
 E  served[Rookham]
 E  served[Sallowmere]
 E  served[Thistlegate]
 E  served[Umberlow]
 E  served[Vetch_Hollow]
 E  served[Wrenfield]
 E  served[Yarrowby]
 L  link[North_Barn,Ashby_Wold]
 L  link[North_Barn,Brackenmere]
 L  link[North_Barn,Coldharbour_Edge]
 L  link[North_Barn,Dunmoss]
 L  link[North_Barn,Eelbrook]
 L  link[North_Barn,Fennick_Cross]
 L  link[North_Barn,Gorsedale]
 L  link[North_Barn,Hollins_Tarn]
 L  link[North_Barn,Inkpen_Vale]
 L  link[North_Barn,Juniper_Lees]
 L  link[North_Barn,Kestle_Moor]
 L  link[North_Barn,Larkspur_Ford]
 L  link[North_Barn,Mossgrave]
 L  link[North_Barn,Nettlecombe]
 L  link[North_Barn,Orrin_Falls]
 L  link[North_Barn,Pennyfold]
 L  link[North_Barn,Quillsby]
 L  link[North_Barn,Rookham]
 L  link[North_Barn,Sallowmere]
 L  link[North_Barn,Thistlegate]
 L  link[North_Barn,Umberlow]
 L  link[North_Barn,Vetch_Hollow]
 L  link[North_Barn,Wrenfield]
 L  link[North_Barn,Yarrowby]
 L  link[Millrace_Yard,Ashby_Wold]
 L  link[Millrace_Yard,Brackenmere]
 L  link[Millrace_Yard,Coldharbour_Edge]
 L  link[Millrace_Yard,Dunmoss]
 L  link[Millrace_Yard,Eelbrook]
 L  link[Millrace_Yard,Fennick_Cross]
 L  link[Millrace_Yard,Gorsedale]
 L  link[Millrace_Yard,Hollins_Tarn]
 L  link[Millrace_Yard,Inkpen_Vale]
 L  link[Millrace_Yard,Juniper_Lees]
 L  link[Millrace_Yard,Kestle_Moor]
 L  link[Millrace_Yard,Larkspur_Ford]
 L  link[Millrace_Yard,Mossgrave]
 L  link[Millrace_Yard,Nettlecombe]
 L  link[Millrace_Yard,Orrin_Falls]
 L  link[Millrace_Yard,Pennyfold]
 L  link[Millrace_Yard,Quillsby]
 L  link[Millrace_Yard,Rookham]
 L  link[Millrace_Yard,Sallowmere]
 L  link[Millrace_Yard,Thistlegate]
 L  link[Millrace_Yard,Umberlow]
 L  link[Millrace_Yard,Vetch_Hollow]
 L  link[Millrace_Yard,Wrenfield]
 L  link[Millrace_Yard,Yarrowby]
 L  link[Old_Creamery,Ashby_Wold]
 L  link[Old_Creamery,Brackenmere]
 L  link[Old_Creamery,Coldharbour_Edge]
 L  link[Old_Creamery,Dunmoss]
 L  link[Old_Creamery,Eelbrook]
 L  link[Old_Creamery,Fennick_Cross]
 L  link[Old_Creamery,Gorsedale]
 L  link[Old_Creamery,Hollins_Tarn]
 L  link[Old_Creamery,Inkpen_Vale]
 L  link[Old_Creamery,Juniper_Lees]
 L  link[Old_Creamery,Kestle_Moor]
 L  link[Old_Creamery,Larkspur_Ford]
 L  link[Old_Creamery,Mossgrave]
 L  link[Old_Creamery,Nettlecombe]
 L  link[Old_Creamery,Orrin_Falls]
 L  link[Old_Creamery,Pennyfold]
 L  link[Old_Creamery,Quillsby]
 L  link[Old_Creamery,Rookham]
 L  link[Old_Creamery,Sallowmere]
 L  link[Old_Creamery,Thistlegate]
 L  link[Old_Creamery,Umberlow]
 L  link[Old_Creamery,Vetch_Hollow]
 L  link[Old_Creamery,Wrenfield]
 L  link[Old_Creamery,Yarrowby]
 L  link[Quarry_Shed,Ashby_Wold]
 L  link[Quarry_Shed,Brackenmere]
 L  link[Quarry_Shed,Coldharbour_Edge]
 L  link[Quarry_Shed,Dunmoss]
 L  link[Quarry_Shed,Eelbrook]
 L  link[Quarry_Shed,Fennick_Cross]
 L  link[Quarry_Shed,Gorsedale]
 L  link[Quarry_Shed,Hollins_Tarn]
 L  link[Quarry_Shed,Inkpen_Vale]
 L  link[Quarry_Shed,Juniper_Lees]
 L  link[Quarry_Shed,Kestle_Moor]
 L  link[Quarry_Shed,Larkspur_Ford]
 L  link[Quarry_Shed,Mossgrave]
 L  link[Quarry_Shed,Nettlecombe]
 L  link[Quarry_Shed,Orrin_Falls]
 L  link[Quarry_Shed,Pennyfold]
 L  link[Quarry_Shed,Quillsby]
 L  link[Quarry_Shed,Rookham]
 L  link[Quarry_Shed,Sallowmere]
 L  link[Quarry_Shed,Thistlegate]
 L  link[Quarry_Shed,Umberlow]
 L  link[Quarry_Shed,Vetch_Hollow]
 L  link[Quarry_Shed,Wrenfield]
 L  link[Quarry_Shed,Yarrowby]
 L  link[Riverside_Store,Ashby_Wold]
 L  link[Riverside_Store,Brackenmere]
 L  link[Riverside_Store,Coldharbour_Edge]
 L  link[Riverside_Store,Dunmoss]
 L  link[Riverside_Store,Eelbrook]
 L  link[Riverside_Store,Fennick_Cross]
 L  link[Riverside_Store,Gorsedale]
 L  link[Riverside_Store,Hollins_Tarn]
 L  link[Riverside_Store,Inkpen_Vale]
 L  link[Riverside_Store,Juniper_Lees]
 L  link[Riverside_Store,Kestle_Moor]
 L  link[Riverside_Store,Larkspur_Ford]
 L  link[Riverside_Store,Mossgrave]
 L  link[Riverside_Store,Nettlecombe]
 L  link[Riverside_Store,Orrin_Falls]
 L  link[Riverside_Store,Pennyfold]
 L  link[Riverside_Store,Quillsby]
 L  link[Riverside_Store,Rookham]
 L  link[Riverside_Store,Sallowmere]
 L  link[Riverside_Store,Thistlegate]
 L  link[Riverside_Store,Umberlow]
 L  link[Riverside_Store,Vetch_Hollow]
 L  link[Riverside_Store,Wrenfield]
 L  link[Riverside_Store,Yarrowby]
 L  link[Tithe_Hall,Ashby_Wold]
 L  link[Tithe_Hall,Brackenmere]
 L  link[Tithe_Hall,Coldharbour_Edge]
 L  link[Tithe_Hall,Dunmoss]
 L  link[Tithe_Hall,Eelbrook]
 L  link[Tithe_Hall,Fennick_Cross]
 L  link[Tithe_Hall,Gorsedale]
 L  link[Tithe_Hall,Hollins_Tarn]
 L  link[Tithe_Hall,Inkpen_Vale]
 L  link[Tithe_Hall,Juniper_Lees]
 L  link[Tithe_Hall,Kestle_Moor]
 L  link[Tithe_Hall,Larkspur_Ford]
 L  link[Tithe_Hall,Mossgrave]
 L  link[Tithe_Hall,Nettlecombe]
 L  link[Tithe_Hall,Orrin_Falls]
 L  link[Tithe_Hall,Pennyfold]
 L  link[Tithe_Hall,Quillsby]
 L  link[Tithe_Hall,Rookham]
 L  link[Tithe_Hall,Sallowmere]
 L  link[Tithe_Hall,Thistlegate]
 L  link[Tithe_Hall,Umberlow]
 L  link[Tithe_Hall,Vetch_Hollow]
 L  link[Tithe_Hall,Wrenfield]
 L  link[Tithe_Hall,Yarrowby]
 L  link[Kiln_Lane,Ashby_Wold]
 L  link[Kiln_Lane,Brackenmere]
 L  link[Kiln_Lane,Coldharbour_Edge]
 L  link[Kiln_Lane,Dunmoss]
 L  link[Kiln_Lane,Eelbrook]
 L  link[Kiln_Lane,Fennick_Cross]
 L  link[Kiln_Lane,Gorsedale]
 L  link[Kiln_Lane,Hollins_Tarn]
 L  link[Kiln_Lane,Inkpen_Vale]
 L  link[Kiln_Lane,Juniper_Lees]
 L  link[Kiln_Lane,Kestle_Moor]
 L  link[Kiln_Lane,Larkspur_Ford]
 L  link[Kiln_Lane,Mossgrave]
 L  link[Kiln_Lane,Nettlecombe]
 L  link[Kiln_Lane,Orrin_Falls]
 L  link[Kiln_Lane,Pennyfold]
 L  link[Kiln_Lane,Quillsby]
 L  link[Kiln_Lane,Rookham]
 L  link[Kiln_Lane,Sallowmere]
 L  link[Kiln_Lane,Thistlegate]
 L  link[Kiln_Lane,Umberlow]
 L  link[Kiln_Lane,Vetch_Hollow]
 L  link[Kiln_Lane,Wrenfield]
 L  link[Kiln_Lane,Yarrowby]
 L  link[Upper_Granary,Ashby_Wold]
 L  link[Upper_Granary,Brackenmere]
 L  link[Upper_Granary,Coldharbour_Edge]
 L  link[Upper_Granary,Dunmoss]
 L  link[Upper_Granary,Eelbrook]
 L  link[Upper_Granary,Fennick_Cross]
 L  link[Upper_Granary,Gorsedale]
 L  link[Upper_Granary,Hollins_Tarn]
 L  link[Upper_Granary,Inkpen_Vale]
 L  link[Upper_Granary,Juniper_Lees]
 L  link[Upper_Granary,Kestle_Moor]
 L  link[Upper_Granary,Larkspur_Ford]
 L  link[Upper_Granary,Mossgrave]
 L  link[Upper_Granary,Nettlecombe]
 L  link[Upper_Granary,Orrin_Falls]
 L  link[Upper_Granary,Pennyfold]
 L  link[Upper_Granary,Quillsby]
 L  link[Upper_Granary,Rookham]
 L  link[Upper_Granary,Sallowmere]
 L  link[Upper_Granary,Thistlegate]
 L  link[Upper_Granary,Umberlow]
 L  link[Upper_Granary,Vetch_Hollow]
 L  link[Upper_Granary,Wrenfield]
 L  link[Upper_Granary,Yarrowby]
COLUMNS
    MARKER  'MARKER'  'INTORG'
    open[North_Barn]  obj  496
    open[North_Barn]  link[North_Barn,Ashby_Wold]  -1
    open[North_Barn]  link[North_Barn,Brackenmere]  -1
    open[North_Barn]  link[North_Barn,Coldharbour_Edge]  -1
    open[North_Barn]  link[North_Barn,Dunmoss]  -1
    open[North_Barn]  link[North_Barn,Eelbrook]  -1
    open[North_Barn]  link[North_Barn,Fennick_Cross]  -1
    open[North_Barn]  link[North_Barn,Gorsedale]  -1
    open[North_Barn]  link[North_Barn,Hollins_Tarn]  -1
    open[North_Barn]  link[North_Barn,Inkpen_Vale]  -1
    open[North_Barn]  link[North_Barn,Juniper_Lees]  -1
    open[North_Barn]  link[North_Barn,Kestle_Moor]  -1
    open[North_Barn]  link[North_Barn,Larkspur_Ford]  -1
    open[North_Barn]  link[North_Barn,Mossgrave]  -1
    open[North_Barn]  link[North_Barn,Nettlecombe]  -1
    open[North_Barn]  link[North_Barn,Orrin_Falls]  -1
    open[North_Barn]  link[North_Barn,Pennyfold]  -1
    open[North_Barn]  link[North_Barn,Quillsby]  -1
    open[North_Barn]  link[North_Barn,Rookham]  -1
    open[North_Barn]  link[North_Barn,Sallowmere]  -1
    open[North_Barn]  link[North_Barn,Thistlegate]  -1
    open[North_Barn]  link[North_Barn,Umberlow]  -1
    open[North_Barn]  link[North_Barn,Vetch_Hollow]  -1
    open[North_Barn]  link[North_Barn,Wrenfield]  -1
    open[North_Barn]  link[North_Barn,Yarrowby]  -1
    open[Millrace_Yard]  obj  447
    open[Millrace_Yard]  link[Millrace_Yard,Ashby_Wold]  -1
    open[Millrace_Yard]  link[Millrace_Yard,Brackenmere]  -1
    open[Millrace_Yard]  link[Millrace_Yard,Coldharbour_Edge]  -1
    open[Millrace_Yard]  link[Millrace_Yard,Dunmoss]  -1
    open[Millrace_Yard]  link[Millrace_Yard,Eelbrook]  -1
    open[Millrace_Yard]  link[Millrace_Yard,Fennick_Cross]  -1
    open[Millrace_Yard]  link[Millrace_Yard,Gorsedale]  -1
    open[Millrace_Yard]  link[Millrace_Yard,Hollins_Tarn]  -1
    open[Millrace_Yard]  link[Millrace_Yard,Inkpen_Vale]  -1
    open[Millrace_Yard]  link[Millrace_Yard,Juniper_Lees]  -1
    open[Millrace_Yard]  link[Millrace_Yard,Kestle_Moor]  -1
    open[Millrace_Yard]  link[Millrace_Yard,Larkspur_Ford]  -1
    open[Millrace_Yard]  link[Millrace_Yard,Mossgrave]  -1
    open[Millrace_Yard]  link[Millrace_Yard,Nettlecombe]  -1
    open[Millrace_Yard]  link[Millrace_Yard,Orrin_Falls]  -1
    open[Millrace_Yard]  link[Millrace_Yard,Pennyfold]  -1
    open[Millrace_Yard]  link[Millrace_Yard,Quillsby]  -1
    open[Millrace_Yard]  link[Millrace_Yard,Rookham]  -1
    open[Millrace_Yard]  link[Millrace_Yard,Sallowmere]  -1
    open[Millrace_Yard]  link[Millrace_Yard,Thistlegate]  -1
    open[Millrace_Yard]  link[Millrace_Yard,Umberlow]  -1
    open[Millrace_Yard]  link[Millrace_Yard,Vetch_Hollow]  -1
    open[Millrace_Yard]  link[Millrace_Yard,Wrenfield]  -1
    open[Millrace_Yard]  link[Millrace_Yard,Yarrowby]  -1
    open[Old_Creamery]  obj  386
    open[Old_Creamery]  link[Old_Creamery,Ashby_Wold]  -1
    open[Old_Creamery]  link[Old_Creamery,Brackenmere]  -1
    open[Old_Creamery]  link[Old_Creamery,Coldharbour_Edge]  -1
    open[Old_Creamery]  link[Old_Creamery,Dunmoss]  -1
    open[Old_Creamery]  link[Old_Creamery,Eelbrook]  -1
    open[Old_Creamery]  link[Old_Creamery,Fennick_Cross]  -1
    open[Old_Creamery]  link[Old_Creamery,Gorsedale]  -1
    open[Old_Creamery]  link[Old_Creamery,Hollins_Tarn]  -1
    open[Old_Creamery]  link[Old_Creamery,Inkpen_Vale]  -1
    open[Old_Creamery]  link[Old_Creamery,Juniper_Lees]  -1
    open[Old_Creamery]  link[Old_Creamery,Kestle_Moor]  -1
    open[Old_Creamery]  link[Old_Creamery,Larkspur_Ford]  -1
    open[Old_Creamery]  link[Old_Creamery,Mossgrave]  -1
    open[Old_Creamery]  link[Old_Creamery,Nettlecombe]  -1
    open[Old_Creamery]  link[Old_Creamery,Orrin_Falls]  -1
    open[Old_Creamery]  link[Old_Creamery,Pennyfold]  -1
    open[Old_Creamery]  link[Old_Creamery,Quillsby]  -1
    open[Old_Creamery]  link[Old_Creamery,Rookham]  -1
    open[Old_Creamery]  link[Old_Creamery,Sallowmere]  -1
    open[Old_Creamery]  link[Old_Creamery,Thistlegate]  -1
    open[Old_Creamery]  link[Old_Creamery,Umberlow]  -1
    open[Old_Creamery]  link[Old_Creamery,Vetch_Hollow]  -1
    open[Old_Creamery]  link[Old_Creamery,Wrenfield]  -1
    open[Old_Creamery]  link[Old_Creamery,Yarrowby]  -1
    open[Quarry_Shed]  obj  555
    open[Quarry_Shed]  link[Quarry_Shed,Ashby_Wold]  -1
    open[Quarry_Shed]  link[Quarry_Shed,Brackenmere]  -1
    open[Quarry_Shed]  link[Quarry_Shed,Coldharbour_Edge]  -1
    open[Quarry_Shed]  link[Quarry_Shed,Dunmoss]  -1
    open[Quarry_Shed]  link[Quarry_Shed,Eelbrook]  -1
    open[Quarry_Shed]  link[Quarry_Shed,Fennick_Cross]  -1
    open[Quarry_Shed]  link[Quarry_Shed,Gorsedale]  -1
    open[Quarry_Shed]  link[Quarry_Shed,Hollins_Tarn]  -1
    open[Quarry_Shed]  link[Quarry_Shed,Inkpen_Vale]  -1
    open[Quarry_Shed]  link[Quarry_Shed,Juniper_Lees]  -1
    open[Quarry_Shed]  link[Quarry_Shed,Kestle_Moor]  -1
    open[Quarry_Shed]  link[Quarry_Shed,Larkspur_Ford]  -1
    open[Quarry_Shed]  link[Quarry_Shed,Mossgrave]  -1
    open[Quarry_Shed]  link[Quarry_Shed,Nettlecombe]  -1
    open[Quarry_Shed]  link[Quarry_Shed,Orrin_Falls]  -1
    open[Quarry_Shed]  link[Quarry_Shed,Pennyfold]  -1
    open[Quarry_Shed]  link[Quarry_Shed,Quillsby]  -1
    open[Quarry_Shed]  link[Quarry_Shed,Rookham]  -1
    open[Quarry_Shed]  link[Quarry_Shed,Sallowmere]  -1
    open[Quarry_Shed]  link[Quarry_Shed,Thistlegate]  -1
    open[Quarry_Shed]  link[Quarry_Shed,Umberlow]  -1
    open[Quarry_Shed]  link[Quarry_Shed,Vetch_Hollow]  -1
    open[Quarry_Shed]  link[Quarry_Shed,Wrenfield]  -1
    open[Quarry_Shed]  link[Quarry_Shed,Yarrowby]  -1
    open[Riverside_Store]  obj  583
    open[Riverside_Store]  link[Riverside_Store,Ashby_Wold]  -1
    open[Riverside_Store]  link[Riverside_Store,Brackenmere]  -1
    open[Riverside_Store]  link[Riverside_Store,Coldharbour_Edge]  -1
    open[Riverside_Store]  link[Riverside_Store,Dunmoss]  -1
    open[Riverside_Store]  link[Riverside_Store,Eelbrook]  -1
    open[Riverside_Store]  link[Riverside_Store,Fennick_Cross]  -1
    open[Riverside_Store]  link[Riverside_Store,Gorsedale]  -1
    open[Riverside_Store]  link[Riverside_Store,Hollins_Tarn]  -1
    open[Riverside_Store]  link[Riverside_Store,Inkpen_Vale]  -1
    open[Riverside_Store]  link[Riverside_Store,Juniper_Lees]  -1
    open[Riverside_Store]  link[Riverside_Store,Kestle_Moor]  -1
    open[Riverside_Store]  link[Riverside_Store,Larkspur_Ford]  -1
    open[Riverside_Store]  link[Riverside_Store,Mossgrave]  -1
    open[Riverside_Store]  link[Riverside_Store,Nettlecombe]  -1
    open[Riverside_Store]  link[Riverside_Store,Orrin_Falls]  -1
    open[Riverside_Store]  link[Riverside_Store,Pennyfold]  -1
    open[Riverside_Store]  link[Riverside_Store,Quillsby]  -1
    open[Riverside_Store]  link[Riverside_Store,Rookham]  -1
    open[Riverside_Store]  link[Riverside_Store,Sallowmere]  -1
    open[Riverside_Store]  link[Riverside_Store,Thistlegate]  -1
    open[Riverside_Store]  link[Riverside_Store,Umberlow]  -1
    open[Riverside_Store]  link[Riverside_Store,Vetch_Hollow]  -1
    open[Riverside_Store]  link[Riverside_Store,Wrenfield]  -1
    open[Riverside_Store]  link[Riverside_Store,Yarrowby]  -1
    open[Tithe_Hall]  obj  365
    open[Tithe_Hall]  link[Tithe_Hall,Ashby_Wold]  -1
    open[Tithe_Hall]  link[Tithe_Hall,Brackenmere]  -1
    open[Tithe_Hall]  link[Tithe_Hall,Coldharbour_Edge]  -1
    open[Tithe_Hall]  link[Tithe_Hall,Dunmoss]  -1
    open[Tithe_Hall]  link[Tithe_Hall,Eelbrook]  -1
    open[Tithe_Hall]  link[Tithe_Hall,Fennick_Cross]  -1
    open[Tithe_Hall]  link[Tithe_Hall,Gorsedale]  -1
    open[Tithe_Hall]  link[Tithe_Hall,Hollins_Tarn]  -1
    open[Tithe_Hall]  link[Tithe_Hall,Inkpen_Vale]  -1
    open[Tithe_Hall]  link[Tithe_Hall,Juniper_Lees]  -1
    open[Tithe_Hall]  link[Tithe_Hall,Kestle_Moor]  -1
    open[Tithe_Hall]  link[Tithe_Hall,Larkspur_Ford]  -1
    open[Tithe_Hall]  link[Tithe_Hall,Mossgrave]  -1
    open[Tithe_Hall]  link[Tithe_Hall,Nettlecombe]  -1
    open[Tithe_Hall]  link[Tithe_Hall,Orrin_Falls]  -1
    open[Tithe_Hall]  link[Tithe_Hall,Pennyfold]  -1
    open[Tithe_Hall]  link[Tithe_Hall,Quillsby]  -1
    open[Tithe_Hall]  link[Tithe_Hall,Rookham]  -1
    open[Tithe_Hall]  link[Tithe_Hall,Sallowmere]  -1
    open[Tithe_Hall]  link[Tithe_Hall,Thistlegate]  -1
    open[Tithe_Hall]  link[Tithe_Hall,Umberlow]  -1
    open[Tithe_Hall]  link[Tithe_Hall,Vetch_Hollow]  -1
    open[Tithe_Hall]  link[Tithe_Hall,Wrenfield]  -1
    open[Tithe_Hall]  link[Tithe_Hall,Yarrowby]  -1
    open[Kiln_Lane]  obj  373
    open[Kiln_Lane]  link[Kiln_Lane,Ashby_Wold]  -1
    open[Kiln_Lane]  link[Kiln_Lane,Brackenmere]  -1
    open[Kiln_Lane]  link[Kiln_Lane,Coldharbour_Edge]  -1
    open[Kiln_Lane]  link[Kiln_Lane,Dunmoss]  -1
    open[Kiln_Lane]  link[Kiln_Lane,Eelbrook]  -1
    open[Kiln_Lane]  link[Kiln_Lane,Fennick_Cross]  -1
    open[Kiln_Lane]  link[Kiln_Lane,Gorsedale]  -1
    open[Kiln_Lane]  link[Kiln_Lane,Hollins_Tarn]  -1
    open[Kiln_Lane]  link[Kiln_Lane,Inkpen_Vale]  -1
    open[Kiln_Lane]  link[Kiln_Lane,Juniper_Lees]  -1
    open[Kiln_Lane]  link[Kiln_Lane,Kestle_Moor]  -1
    open[Kiln_Lane]  link[Kiln_Lane,Larkspur_Ford]  -1
    open[Kiln_Lane]  link[Kiln_Lane,Mossgrave]  -1
    open[Kiln_Lane]  link[Kiln_Lane,Nettlecombe]  -1
    open[Kiln_Lane]  link[Kiln_Lane,Orrin_Falls]  -1
    open[Kiln_Lane]  link[Kiln_Lane,Pennyfold]  -1
    open[Kiln_Lane]  link[Kiln_Lane,Quillsby]  -1
    open[Kiln_Lane]  link[Kiln_Lane,Rookham]  -1
    open[Kiln_Lane]  link[Kiln_Lane,Sallowmere]  -1
    open[Kiln_Lane]  link[Kiln_Lane,Thistlegate]  -1
    open[Kiln_Lane]  link[Kiln_Lane,Umberlow]  -1
    open[Kiln_Lane]  link[Kiln_Lane,Vetch_Hollow]  -1
    open[Kiln_Lane]  link[Kiln_Lane,Wrenfield]  -1
    open[Kiln_Lane]  link[Kiln_Lane,Yarrowby]  -1
    open[Upper_Granary]  obj  394
    open[Upper_Granary]  link[Upper_Granary,Ashby_Wold]  -1
    open[Upper_Granary]  link[Upper_Granary,Brackenmere]  -1
    open[Upper_Granary]  link[Upper_Granary,Coldharbour_Edge]  -1
    open[Upper_Granary]  link[Upper_Granary,Dunmoss]  -1
    open[Upper_Granary]  link[Upper_Granary,Eelbrook]  -1
    open[Upper_Granary]  link[Upper_Granary,Fennick_Cross]  -1
    open[Upper_Granary]  link[Upper_Granary,Gorsedale]  -1
    open[Upper_Granary]  link[Upper_Granary,Hollins_Tarn]  -1
    open[Upper_Granary]  link[Upper_Granary,Inkpen_Vale]  -1
    open[Upper_Granary]  link[Upper_Granary,Juniper_Lees]  -1
    open[Upper_Granary]  link[Upper_Granary,Kestle_Moor]  -1
    open[Upper_Granary]  link[Upper_Granary,Larkspur_Ford]  -1
    open[Upper_Granary]  link[Upper_Granary,Mossgrave]  -1
    open[Upper_Granary]  link[Upper_Granary,Nettlecombe]  -1
    open[Upper_Granary]  link[Upper_Granary,Orrin_Falls]  -1
    open[Upper_Granary]  link[Upper_Granary,Pennyfold]  -1
    open[Upper_Granary]  link[Upper_Granary,Quillsby]  -1
    open[Upper_Granary]  link[Upper_Granary,Rookham]  -1
    open[Upper_Granary]  link[Upper_Granary,Sallowmere]  -1
    open[Upper_Granary]  link[Upper_Granary,Thistlegate]  -1
    open[Upper_Granary]  link[Upper_Granary,Umberlow]  -1
    open[Upper_Granary]  link[Upper_Granary,Vetch_Hollow]  -1
    open[Upper_Granary]  link[Upper_Granary,Wrenfield]  -1
    open[Upper_Granary]  link[Upper_Granary,Yarrowby]  -1
    MARKER  'MARKER'  'INTEND'
    share[North_Barn,Ashby_Wold]  obj  113.8
    share[North_Barn,Ashby_Wold]  served[Ashby_Wold]  1
    share[North_Barn,Ashby_Wold]  link[North_Barn,Ashby_Wold]  1
    share[North_Barn,Brackenmere]  obj  158.7
    share[North_Barn,Brackenmere]  served[Brackenmere]  1
    share[North_Barn,Brackenmere]  link[North_Barn,Brackenmere]  1
    share[North_Barn,Coldharbour_Edge]  obj  261.5
    share[North_Barn,Coldharbour_Edge]  served[Coldharbour_Edge]  1
    share[North_Barn,Coldharbour_Edge]  link[North_Barn,Coldharbour_Edge]  1
    share[North_Barn,Dunmoss]  obj  38.3
    share[North_Barn,Dunmoss]  served[Dunmoss]  1
    share[North_Barn,Dunmoss]  link[North_Barn,Dunmoss]  1
    share[North_Barn,Eelbrook]  obj  68
    share[North_Barn,Eelbrook]  served[Eelbrook]  1
    share[North_Barn,Eelbrook]  link[North_Barn,Eelbrook]  1
    share[North_Barn,Fennick_Cross]  obj  19.3
    share[North_Barn,Fennick_Cross]  served[Fennick_Cross]  1
    share[North_Barn,Fennick_Cross]  link[North_Barn,Fennick_Cross]  1
    share[North_Barn,Gorsedale]  obj  66.1
    share[North_Barn,Gorsedale]  served[Gorsedale]  1
    share[North_Barn,Gorsedale]  link[North_Barn,Gorsedale]  1
    share[North_Barn,Hollins_Tarn]  obj  76.9
    share[North_Barn,Hollins_Tarn]  served[Hollins_Tarn]  1
    share[North_Barn,Hollins_Tarn]  link[North_Barn,Hollins_Tarn]  1
    share[North_Barn,Inkpen_Vale]  obj  103.8
    share[North_Barn,Inkpen_Vale]  served[Inkpen_Vale]  1
    share[North_Barn,Inkpen_Vale]  link[North_Barn,Inkpen_Vale]  1
    share[North_Barn,Juniper_Lees]  obj  125
    share[North_Barn,Juniper_Lees]  served[Juniper_Lees]  1
    share[North_Barn,Juniper_Lees]  link[North_Barn,Juniper_Lees]  1
    share[North_Barn,Kestle_Moor]  obj  142.7
    share[North_Barn,Kestle_Moor]  served[Kestle_Moor]  1
    share[North_Barn,Kestle_Moor]  link[North_Barn,Kestle_Moor]  1
    share[North_Barn,Larkspur_Ford]  obj  41.1
    share[North_Barn,Larkspur_Ford]  served[Larkspur_Ford]  1
    share[North_Barn,Larkspur_Ford]  link[North_Barn,Larkspur_Ford]  1
    share[North_Barn,Mossgrave]  obj  47
    share[North_Barn,Mossgrave]  served[Mossgrave]  1
    share[North_Barn,Mossgrave]  link[North_Barn,Mossgrave]  1
    share[North_Barn,Nettlecombe]  obj  54.8
    share[North_Barn,Nettlecombe]  served[Nettlecombe]  1
    share[North_Barn,Nettlecombe]  link[North_Barn,Nettlecombe]  1
    share[North_Barn,Orrin_Falls]  obj  144.4
    share[North_Barn,Orrin_Falls]  served[Orrin_Falls]  1
    share[North_Barn,Orrin_Falls]  link[North_Barn,Orrin_Falls]  1
    share[North_Barn,Pennyfold]  obj  47.4
    share[North_Barn,Pennyfold]  served[Pennyfold]  1
    share[North_Barn,Pennyfold]  link[North_Barn,Pennyfold]  1
    share[North_Barn,Quillsby]  obj  109.6
    share[North_Barn,Quillsby]  served[Quillsby]  1
    share[North_Barn,Quillsby]  link[North_Barn,Quillsby]  1
    share[North_Barn,Rookham]  obj  26.8
    share[North_Barn,Rookham]  served[Rookham]  1
    share[North_Barn,Rookham]  link[North_Barn,Rookham]  1
    share[North_Barn,Sallowmere]  obj  103.6
    share[North_Barn,Sallowmere]  served[Sallowmere]  1
    share[North_Barn,Sallowmere]  link[North_Barn,Sallowmere]  1
    share[North_Barn,Thistlegate]  obj  36.1
    share[North_Barn,Thistlegate]  served[Thistlegate]  1
    share[North_Barn,Thistlegate]  link[North_Barn,Thistlegate]  1
    share[North_Barn,Umberlow]  obj  35.8
    share[North_Barn,Umberlow]  served[Umberlow]  1
    share[North_Barn,Umberlow]  link[North_Barn,Umberlow]  1
    share[North_Barn,Vetch_Hollow]  obj  39.5
    share[North_Barn,Vetch_Hollow]  served[Vetch_Hollow]  1
    share[North_Barn,Vetch_Hollow]  link[North_Barn,Vetch_Hollow]  1
    share[North_Barn,Wrenfield]  obj  99.5
    share[North_Barn,Wrenfield]  served[Wrenfield]  1
    share[North_Barn,Wrenfield]  link[North_Barn,Wrenfield]  1
    share[North_Barn,Yarrowby]  obj  115.6
    share[North_Barn,Yarrowby]  served[Yarrowby]  1
    share[North_Barn,Yarrowby]  link[North_Barn,Yarrowby]  1
    share[Millrace_Yard,Ashby_Wold]  obj  102.6
    share[Millrace_Yard,Ashby_Wold]  served[Ashby_Wold]  1
    share[Millrace_Yard,Ashby_Wold]  link[Millrace_Yard,Ashby_Wold]  1
    share[Millrace_Yard,Brackenmere]  obj  129.5
    share[Millrace_Yard,Brackenmere]  served[Brackenmere]  1
    share[Millrace_Yard,Brackenmere]  link[Millrace_Yard,Brackenmere]  1
    share[Millrace_Yard,Coldharbour_Edge]  obj  121.3
    share[Millrace_Yard,Coldharbour_Edge]  served[Coldharbour_Edge]  1
    share[Millrace_Yard,Coldharbour_Edge]  link[Millrace_Yard,Coldharbour_Edge]  1
    share[Millrace_Yard,Dunmoss]  obj  41.2
    share[Millrace_Yard,Dunmoss]  served[Dunmoss]  1
    share[Millrace_Yard,Dunmoss]  link[Millrace_Yard,Dunmoss]  1
    share[Millrace_Yard,Eelbrook]  obj  172.3
    share[Millrace_Yard,Eelbrook]  served[Eelbrook]  1
    share[Millrace_Yard,Eelbrook]  link[Millrace_Yard,Eelbrook]  1
    share[Millrace_Yard,Fennick_Cross]  obj  51.3
    share[Millrace_Yard,Fennick_Cross]  served[Fennick_Cross]  1
    share[Millrace_Yard,Fennick_Cross]  link[Millrace_Yard,Fennick_Cross]  1
    share[Millrace_Yard,Gorsedale]  obj  22.7
    share[Millrace_Yard,Gorsedale]  served[Gorsedale]  1
    share[Millrace_Yard,Gorsedale]  link[Millrace_Yard,Gorsedale]  1
    share[Millrace_Yard,Hollins_Tarn]  obj  53.7
    share[Millrace_Yard,Hollins_Tarn]  served[Hollins_Tarn]  1
    share[Millrace_Yard,Hollins_Tarn]  link[Millrace_Yard,Hollins_Tarn]  1
    share[Millrace_Yard,Inkpen_Vale]  obj  262.7
    share[Millrace_Yard,Inkpen_Vale]  served[Inkpen_Vale]  1
    share[Millrace_Yard,Inkpen_Vale]  link[Millrace_Yard,Inkpen_Vale]  1
    share[Millrace_Yard,Juniper_Lees]  obj  56.4
    share[Millrace_Yard,Juniper_Lees]  served[Juniper_Lees]  1
    share[Millrace_Yard,Juniper_Lees]  link[Millrace_Yard,Juniper_Lees]  1
    share[Millrace_Yard,Kestle_Moor]  obj  43.2
    share[Millrace_Yard,Kestle_Moor]  served[Kestle_Moor]  1
    share[Millrace_Yard,Kestle_Moor]  link[Millrace_Yard,Kestle_Moor]  1
    share[Millrace_Yard,Larkspur_Ford]  obj  17.7
    share[Millrace_Yard,Larkspur_Ford]  served[Larkspur_Ford]  1
    share[Millrace_Yard,Larkspur_Ford]  link[Millrace_Yard,Larkspur_Ford]  1
    share[Millrace_Yard,Mossgrave]  obj  89.1
    share[Millrace_Yard,Mossgrave]  served[Mossgrave]  1
    share[Millrace_Yard,Mossgrave]  link[Millrace_Yard,Mossgrave]  1
    share[Millrace_Yard,Nettlecombe]  obj  127.3
    share[Millrace_Yard,Nettlecombe]  served[Nettlecombe]  1
    share[Millrace_Yard,Nettlecombe]  link[Millrace_Yard,Nettlecombe]  1
    share[Millrace_Yard,Orrin_Falls]  obj  132.3
    share[Millrace_Yard,Orrin_Falls]  served[Orrin_Falls]  1
    share[Millrace_Yard,Orrin_Falls]  link[Millrace_Yard,Orrin_Falls]  1
    share[Millrace_Yard,Pennyfold]  obj  23.6
    share[Millrace_Yard,Pennyfold]  served[Pennyfold]  1
    share[Millrace_Yard,Pennyfold]  link[Millrace_Yard,Pennyfold]  1
    share[Millrace_Yard,Quillsby]  obj  234
    share[Millrace_Yard,Quillsby]  served[Quillsby]  1
    share[Millrace_Yard,Quillsby]  link[Millrace_Yard,Quillsby]  1
    share[Millrace_Yard,Rookham]  obj  47.4
    share[Millrace_Yard,Rookham]  served[Rookham]  1
    share[Millrace_Yard,Rookham]  link[Millrace_Yard,Rookham]  1
    share[Millrace_Yard,Sallowmere]  obj  120.3
    share[Millrace_Yard,Sallowmere]  served[Sallowmere]  1
    share[Millrace_Yard,Sallowmere]  link[Millrace_Yard,Sallowmere]  1
    share[Millrace_Yard,Thistlegate]  obj  30.5
    share[Millrace_Yard,Thistlegate]  served[Thistlegate]  1
    share[Millrace_Yard,Thistlegate]  link[Millrace_Yard,Thistlegate]  1
    share[Millrace_Yard,Umberlow]  obj  57.6
    share[Millrace_Yard,Umberlow]  served[Umberlow]  1
    share[Millrace_Yard,Umberlow]  link[Millrace_Yard,Umberlow]  1
    share[Millrace_Yard,Vetch_Hollow]  obj  63.9
    share[Millrace_Yard,Vetch_Hollow]  served[Vetch_Hollow]  1
    share[Millrace_Yard,Vetch_Hollow]  link[Millrace_Yard,Vetch_Hollow]  1
    share[Millrace_Yard,Wrenfield]  obj  278.5
    share[Millrace_Yard,Wrenfield]  served[Wrenfield]  1
    share[Millrace_Yard,Wrenfield]  link[Millrace_Yard,Wrenfield]  1
    share[Millrace_Yard,Yarrowby]  obj  38.5
    share[Millrace_Yard,Yarrowby]  served[Yarrowby]  1
    share[Millrace_Yard,Yarrowby]  link[Millrace_Yard,Yarrowby]  1
    share[Old_Creamery,Ashby_Wold]  obj  140.2
    share[Old_Creamery,Ashby_Wold]  served[Ashby_Wold]  1
    share[Old_Creamery,Ashby_Wold]  link[Old_Creamery,Ashby_Wold]  1
    share[Old_Creamery,Brackenmere]  obj  176.8
    share[Old_Creamery,Brackenmere]  served[Brackenmere]  1
    share[Old_Creamery,Brackenmere]  link[Old_Creamery,Brackenmere]  1
    share[Old_Creamery,Coldharbour_Edge]  obj  320
    share[Old_Creamery,Coldharbour_Edge]  served[Coldharbour_Edge]  1
    share[Old_Creamery,Coldharbour_Edge]  link[Old_Creamery,Coldharbour_Edge]  1
    share[Old_Creamery,Dunmoss]  obj  54.2
    share[Old_Creamery,Dunmoss]  served[Dunmoss]  1
    share[Old_Creamery,Dunmoss]  link[Old_Creamery,Dunmoss]  1
    share[Old_Creamery,Eelbrook]  obj  110.4
    share[Old_Creamery,Eelbrook]  served[Eelbrook]  1
    share[Old_Creamery,Eelbrook]  link[Old_Creamery,Eelbrook]  1
    share[Old_Creamery,Fennick_Cross]  obj  9.2
    share[Old_Creamery,Fennick_Cross]  served[Fennick_Cross]  1
    share[Old_Creamery,Fennick_Cross]  link[Old_Creamery,Fennick_Cross]  1
    share[Old_Creamery,Gorsedale]  obj  86
    share[Old_Creamery,Gorsedale]  served[Gorsedale]  1
    share[Old_Creamery,Gorsedale]  link[Old_Creamery,Gorsedale]  1
    share[Old_Creamery,Hollins_Tarn]  obj  137.8
    share[Old_Creamery,Hollins_Tarn]  served[Hollins_Tarn]  1
    share[Old_Creamery,Hollins_Tarn]  link[Old_Creamery,Hollins_Tarn]  1
    share[Old_Creamery,Inkpen_Vale]  obj  18.8
    share[Old_Creamery,Inkpen_Vale]  served[Inkpen_Vale]  1
    share[Old_Creamery,Inkpen_Vale]  link[Old_Creamery,Inkpen_Vale]  1
    share[Old_Creamery,Juniper_Lees]  obj  224.1
    share[Old_Creamery,Juniper_Lees]  served[Juniper_Lees]  1
    share[Old_Creamery,Juniper_Lees]  link[Old_Creamery,Juniper_Lees]  1
    share[Old_Creamery,Kestle_Moor]  obj  206.1
    share[Old_Creamery,Kestle_Moor]  served[Kestle_Moor]  1
    share[Old_Creamery,Kestle_Moor]  link[Old_Creamery,Kestle_Moor]  1
    share[Old_Creamery,Larkspur_Ford]  obj  51.8
    share[Old_Creamery,Larkspur_Ford]  served[Larkspur_Ford]  1
    share[Old_Creamery,Larkspur_Ford]  link[Old_Creamery,Larkspur_Ford]  1
    share[Old_Creamery,Mossgrave]  obj  110.5
    share[Old_Creamery,Mossgrave]  served[Mossgrave]  1
    share[Old_Creamery,Mossgrave]  link[Old_Creamery,Mossgrave]  1
    share[Old_Creamery,Nettlecombe]  obj  125
    share[Old_Creamery,Nettlecombe]  served[Nettlecombe]  1
    share[Old_Creamery,Nettlecombe]  link[Old_Creamery,Nettlecombe]  1
    share[Old_Creamery,Orrin_Falls]  obj  142.7
    share[Old_Creamery,Orrin_Falls]  served[Orrin_Falls]  1
    share[Old_Creamery,Orrin_Falls]  link[Old_Creamery,Orrin_Falls]  1
    share[Old_Creamery,Pennyfold]  obj  83.8
    share[Old_Creamery,Pennyfold]  served[Pennyfold]  1
    share[Old_Creamery,Pennyfold]  link[Old_Creamery,Pennyfold]  1
    share[Old_Creamery,Quillsby]  obj  15.2
    share[Old_Creamery,Quillsby]  served[Quillsby]  1
    share[Old_Creamery,Quillsby]  link[Old_Creamery,Quillsby]  1
    share[Old_Creamery,Rookham]  obj  27.4
    share[Old_Creamery,Rookham]  served[Rookham]  1
    share[Old_Creamery,Rookham]  link[Old_Creamery,Rookham]  1
    share[Old_Creamery,Sallowmere]  obj  197.8
    share[Old_Creamery,Sallowmere]  served[Sallowmere]  1
    share[Old_Creamery,Sallowmere]  link[Old_Creamery,Sallowmere]  1
    share[Old_Creamery,Thistlegate]  obj  38.8
    share[Old_Creamery,Thistlegate]  served[Thistlegate]  1
    share[Old_Creamery,Thistlegate]  link[Old_Creamery,Thistlegate]  1
    share[Old_Creamery,Umberlow]  obj  88.4
    share[Old_Creamery,Umberlow]  served[Umberlow]  1
    share[Old_Creamery,Umberlow]  link[Old_Creamery,Umberlow]  1
    share[Old_Creamery,Vetch_Hollow]  obj  90.9
    share[Old_Creamery,Vetch_Hollow]  served[Vetch_Hollow]  1
    share[Old_Creamery,Vetch_Hollow]  link[Old_Creamery,Vetch_Hollow]  1
    share[Old_Creamery,Wrenfield]  obj  42.6
    share[Old_Creamery,Wrenfield]  served[Wrenfield]  1
    share[Old_Creamery,Wrenfield]  link[Old_Creamery,Wrenfield]  1
    share[Old_Creamery,Yarrowby]  obj  198.3
    share[Old_Creamery,Yarrowby]  served[Yarrowby]  1
    share[Old_Creamery,Yarrowby]  link[Old_Creamery,Yarrowby]  1
    share[Quarry_Shed,Ashby_Wold]  obj  149.4
    share[Quarry_Shed,Ashby_Wold]  served[Ashby_Wold]  1
    share[Quarry_Shed,Ashby_Wold]  link[Quarry_Shed,Ashby_Wold]  1
    share[Quarry_Shed,Brackenmere]  obj  196.9
    share[Quarry_Shed,Brackenmere]  served[Brackenmere]  1
    share[Quarry_Shed,Brackenmere]  link[Quarry_Shed,Brackenmere]  1
    share[Quarry_Shed,Coldharbour_Edge]  obj  264.9
    share[Quarry_Shed,Coldharbour_Edge]  served[Coldharbour_Edge]  1
    share[Quarry_Shed,Coldharbour_Edge]  link[Quarry_Shed,Coldharbour_Edge]  1
    share[Quarry_Shed,Dunmoss]  obj  53.9
    share[Quarry_Shed,Dunmoss]  served[Dunmoss]  1
    share[Quarry_Shed,Dunmoss]  link[Quarry_Shed,Dunmoss]  1
    share[Quarry_Shed,Eelbrook]  obj  151.6
    share[Quarry_Shed,Eelbrook]  served[Eelbrook]  1
    share[Quarry_Shed,Eelbrook]  link[Quarry_Shed,Eelbrook]  1
    share[Quarry_Shed,Fennick_Cross]  obj  41.5
    share[Quarry_Shed,Fennick_Cross]  served[Fennick_Cross]  1
    share[Quarry_Shed,Fennick_Cross]  link[Quarry_Shed,Fennick_Cross]  1
    share[Quarry_Shed,Gorsedale]  obj  63.8
    share[Quarry_Shed,Gorsedale]  served[Gorsedale]  1
    share[Quarry_Shed,Gorsedale]  link[Quarry_Shed,Gorsedale]  1
    share[Quarry_Shed,Hollins_Tarn]  obj  80.4
    share[Quarry_Shed,Hollins_Tarn]  served[Hollins_Tarn]  1
    share[Quarry_Shed,Hollins_Tarn]  link[Quarry_Shed,Hollins_Tarn]  1
    share[Quarry_Shed,Inkpen_Vale]  obj  199.2
    share[Quarry_Shed,Inkpen_Vale]  served[Inkpen_Vale]  1
    share[Quarry_Shed,Inkpen_Vale]  link[Quarry_Shed,Inkpen_Vale]  1
    share[Quarry_Shed,Juniper_Lees]  obj  97.2
    share[Quarry_Shed,Juniper_Lees]  served[Juniper_Lees]  1
    share[Quarry_Shed,Juniper_Lees]  link[Quarry_Shed,Juniper_Lees]  1
    share[Quarry_Shed,Kestle_Moor]  obj  139.7
    share[Quarry_Shed,Kestle_Moor]  served[Kestle_Moor]  1
    share[Quarry_Shed,Kestle_Moor]  link[Quarry_Shed,Kestle_Moor]  1
    share[Quarry_Shed,Larkspur_Ford]  obj  41.8
    share[Quarry_Shed,Larkspur_Ford]  served[Larkspur_Ford]  1
    share[Quarry_Shed,Larkspur_Ford]  link[Quarry_Shed,Larkspur_Ford]  1
    share[Quarry_Shed,Mossgrave]  obj  12
    share[Quarry_Shed,Mossgrave]  served[Mossgrave]  1
    share[Quarry_Shed,Mossgrave]  link[Quarry_Shed,Mossgrave]  1
    share[Quarry_Shed,Nettlecombe]  obj  109.2
    share[Quarry_Shed,Nettlecombe]  served[Nettlecombe]  1
    share[Quarry_Shed,Nettlecombe]  link[Quarry_Shed,Nettlecombe]  1
    share[Quarry_Shed,Orrin_Falls]  obj  181.8
    share[Quarry_Shed,Orrin_Falls]  served[Orrin_Falls]  1
    share[Quarry_Shed,Orrin_Falls]  link[Quarry_Shed,Orrin_Falls]  1
    share[Quarry_Shed,Pennyfold]  obj  26.2
    share[Quarry_Shed,Pennyfold]  served[Pennyfold]  1
    share[Quarry_Shed,Pennyfold]  link[Quarry_Shed,Pennyfold]  1
    share[Quarry_Shed,Quillsby]  obj  191.7
    share[Quarry_Shed,Quillsby]  served[Quillsby]  1
    share[Quarry_Shed,Quillsby]  link[Quarry_Shed,Quillsby]  1
    share[Quarry_Shed,Rookham]  obj  47.8
    share[Quarry_Shed,Rookham]  served[Rookham]  1
    share[Quarry_Shed,Rookham]  link[Quarry_Shed,Rookham]  1
    share[Quarry_Shed,Sallowmere]  obj  21.3
    share[Quarry_Shed,Sallowmere]  served[Sallowmere]  1
    share[Quarry_Shed,Sallowmere]  link[Quarry_Shed,Sallowmere]  1
    share[Quarry_Shed,Thistlegate]  obj  45
    share[Quarry_Shed,Thistlegate]  served[Thistlegate]  1
    share[Quarry_Shed,Thistlegate]  link[Quarry_Shed,Thistlegate]  1
    share[Quarry_Shed,Umberlow]  obj  42.5
    share[Quarry_Shed,Umberlow]  served[Umberlow]  1
    share[Quarry_Shed,Umberlow]  link[Quarry_Shed,Umberlow]  1
    share[Quarry_Shed,Vetch_Hollow]  obj  5.6
    share[Quarry_Shed,Vetch_Hollow]  served[Vetch_Hollow]  1
    share[Quarry_Shed,Vetch_Hollow]  link[Quarry_Shed,Vetch_Hollow]  1
    share[Quarry_Shed,Wrenfield]  obj  199
    share[Quarry_Shed,Wrenfield]  served[Wrenfield]  1
    share[Quarry_Shed,Wrenfield]  link[Quarry_Shed,Wrenfield]  1
    share[Quarry_Shed,Yarrowby]  obj  91.1
    share[Quarry_Shed,Yarrowby]  served[Yarrowby]  1
    share[Quarry_Shed,Yarrowby]  link[Quarry_Shed,Yarrowby]  1
    share[Riverside_Store,Ashby_Wold]  obj  62.7
    share[Riverside_Store,Ashby_Wold]  served[Ashby_Wold]  1
    share[Riverside_Store,Ashby_Wold]  link[Riverside_Store,Ashby_Wold]  1
    share[Riverside_Store,Brackenmere]  obj  34.6
    share[Riverside_Store,Brackenmere]  served[Brackenmere]  1
    share[Riverside_Store,Brackenmere]  link[Riverside_Store,Brackenmere]  1
    share[Riverside_Store,Coldharbour_Edge]  obj  121.4
    share[Riverside_Store,Coldharbour_Edge]  served[Coldharbour_Edge]  1
    share[Riverside_Store,Coldharbour_Edge]  link[Riverside_Store,Coldharbour_Edge]  1
    share[Riverside_Store,Dunmoss]  obj  37.6
    share[Riverside_Store,Dunmoss]  served[Dunmoss]  1
    share[Riverside_Store,Dunmoss]  link[Riverside_Store,Dunmoss]  1
    share[Riverside_Store,Eelbrook]  obj  166.8
    share[Riverside_Store,Eelbrook]  served[Eelbrook]  1
    share[Riverside_Store,Eelbrook]  link[Riverside_Store,Eelbrook]  1
    share[Riverside_Store,Fennick_Cross]  obj  44.1
    share[Riverside_Store,Fennick_Cross]  served[Fennick_Cross]  1
    share[Riverside_Store,Fennick_Cross]  link[Riverside_Store,Fennick_Cross]  1
    share[Riverside_Store,Gorsedale]  obj  40
    share[Riverside_Store,Gorsedale]  served[Gorsedale]  1
    share[Riverside_Store,Gorsedale]  link[Riverside_Store,Gorsedale]  1
    share[Riverside_Store,Hollins_Tarn]  obj  112.5
    share[Riverside_Store,Hollins_Tarn]  served[Hollins_Tarn]  1
    share[Riverside_Store,Hollins_Tarn]  link[Riverside_Store,Hollins_Tarn]  1
    share[Riverside_Store,Inkpen_Vale]  obj  236
    share[Riverside_Store,Inkpen_Vale]  served[Inkpen_Vale]  1
    share[Riverside_Store,Inkpen_Vale]  link[Riverside_Store,Inkpen_Vale]  1
    share[Riverside_Store,Juniper_Lees]  obj  189.7
    share[Riverside_Store,Juniper_Lees]  served[Juniper_Lees]  1
    share[Riverside_Store,Juniper_Lees]  link[Riverside_Store,Juniper_Lees]  1
    share[Riverside_Store,Kestle_Moor]  obj  115.4
    share[Riverside_Store,Kestle_Moor]  served[Kestle_Moor]  1
    share[Riverside_Store,Kestle_Moor]  link[Riverside_Store,Kestle_Moor]  1
    share[Riverside_Store,Larkspur_Ford]  obj  20.4
    share[Riverside_Store,Larkspur_Ford]  served[Larkspur_Ford]  1
    share[Riverside_Store,Larkspur_Ford]  link[Riverside_Store,Larkspur_Ford]  1
    share[Riverside_Store,Mossgrave]  obj  151.1
    share[Riverside_Store,Mossgrave]  served[Mossgrave]  1
    share[Riverside_Store,Mossgrave]  link[Riverside_Store,Mossgrave]  1
    share[Riverside_Store,Nettlecombe]  obj  155.4
    share[Riverside_Store,Nettlecombe]  served[Nettlecombe]  1
    share[Riverside_Store,Nettlecombe]  link[Riverside_Store,Nettlecombe]  1
    share[Riverside_Store,Orrin_Falls]  obj  15.6
    share[Riverside_Store,Orrin_Falls]  served[Orrin_Falls]  1
    share[Riverside_Store,Orrin_Falls]  link[Riverside_Store,Orrin_Falls]  1
    share[Riverside_Store,Pennyfold]  obj  77.3
    share[Riverside_Store,Pennyfold]  served[Pennyfold]  1
    share[Riverside_Store,Pennyfold]  link[Riverside_Store,Pennyfold]  1
    share[Riverside_Store,Quillsby]  obj  192
    share[Riverside_Store,Quillsby]  served[Quillsby]  1
    share[Riverside_Store,Quillsby]  link[Riverside_Store,Quillsby]  1
    share[Riverside_Store,Rookham]  obj  34.5
    share[Riverside_Store,Rookham]  served[Rookham]  1
    share[Riverside_Store,Rookham]  link[Riverside_Store,Rookham]  1
    share[Riverside_Store,Sallowmere]  obj  235.3
    share[Riverside_Store,Sallowmere]  served[Sallowmere]  1
    share[Riverside_Store,Sallowmere]  link[Riverside_Store,Sallowmere]  1
    share[Riverside_Store,Thistlegate]  obj  5.4
    share[Riverside_Store,Thistlegate]  served[Thistlegate]  1
    share[Riverside_Store,Thistlegate]  link[Riverside_Store,Thistlegate]  1
    share[Riverside_Store,Umberlow]  obj  99.2
    share[Riverside_Store,Umberlow]  served[Umberlow]  1
    share[Riverside_Store,Umberlow]  link[Riverside_Store,Umberlow]  1
    share[Riverside_Store,Vetch_Hollow]  obj  116.3
    share[Riverside_Store,Vetch_Hollow]  served[Vetch_Hollow]  1
    share[Riverside_Store,Vetch_Hollow]  link[Riverside_Store,Vetch_Hollow]  1
    share[Riverside_Store,Wrenfield]  obj  265.7
    share[Riverside_Store,Wrenfield]  served[Wrenfield]  1
    share[Riverside_Store,Wrenfield]  link[Riverside_Store,Wrenfield]  1
    share[Riverside_Store,Yarrowby]  obj  158.9
    share[Riverside_Store,Yarrowby]  served[Yarrowby]  1
    share[Riverside_Store,Yarrowby]  link[Riverside_Store,Yarrowby]  1
    share[Tithe_Hall,Ashby_Wold]  obj  63.3
    share[Tithe_Hall,Ashby_Wold]  served[Ashby_Wold]  1
    share[Tithe_Hall,Ashby_Wold]  link[Tithe_Hall,Ashby_Wold]  1
    share[Tithe_Hall,Brackenmere]  obj  103.3
    share[Tithe_Hall,Brackenmere]  served[Brackenmere]  1
    share[Tithe_Hall,Brackenmere]  link[Tithe_Hall,Brackenmere]  1
    share[Tithe_Hall,Coldharbour_Edge]  obj  198.5
    share[Tithe_Hall,Coldharbour_Edge]  served[Coldharbour_Edge]  1
    share[Tithe_Hall,Coldharbour_Edge]  link[Tithe_Hall,Coldharbour_Edge]  1
    share[Tithe_Hall,Dunmoss]  obj  16.8
    share[Tithe_Hall,Dunmoss]  served[Dunmoss]  1
    share[Tithe_Hall,Dunmoss]  link[Tithe_Hall,Dunmoss]  1
    share[Tithe_Hall,Eelbrook]  obj  22.9
    share[Tithe_Hall,Eelbrook]  served[Eelbrook]  1
    share[Tithe_Hall,Eelbrook]  link[Tithe_Hall,Eelbrook]  1
    share[Tithe_Hall,Fennick_Cross]  obj  19.2
    share[Tithe_Hall,Fennick_Cross]  served[Fennick_Cross]  1
    share[Tithe_Hall,Fennick_Cross]  link[Tithe_Hall,Fennick_Cross]  1
    share[Tithe_Hall,Gorsedale]  obj  50.3
    share[Tithe_Hall,Gorsedale]  served[Gorsedale]  1
    share[Tithe_Hall,Gorsedale]  link[Tithe_Hall,Gorsedale]  1
    share[Tithe_Hall,Hollins_Tarn]  obj  48.3
    share[Tithe_Hall,Hollins_Tarn]  served[Hollins_Tarn]  1
    share[Tithe_Hall,Hollins_Tarn]  link[Tithe_Hall,Hollins_Tarn]  1
    share[Tithe_Hall,Inkpen_Vale]  obj  124.6
    share[Tithe_Hall,Inkpen_Vale]  served[Inkpen_Vale]  1
    share[Tithe_Hall,Inkpen_Vale]  link[Tithe_Hall,Inkpen_Vale]  1
    share[Tithe_Hall,Juniper_Lees]  obj  99.6
    share[Tithe_Hall,Juniper_Lees]  served[Juniper_Lees]  1
    share[Tithe_Hall,Juniper_Lees]  link[Tithe_Hall,Juniper_Lees]  1
    share[Tithe_Hall,Kestle_Moor]  obj  99.8
    share[Tithe_Hall,Kestle_Moor]  served[Kestle_Moor]  1
    share[Tithe_Hall,Kestle_Moor]  link[Tithe_Hall,Kestle_Moor]  1
    share[Tithe_Hall,Larkspur_Ford]  obj  30.4
    share[Tithe_Hall,Larkspur_Ford]  served[Larkspur_Ford]  1
    share[Tithe_Hall,Larkspur_Ford]  link[Tithe_Hall,Larkspur_Ford]  1
    share[Tithe_Hall,Mossgrave]  obj  68.6
    share[Tithe_Hall,Mossgrave]  served[Mossgrave]  1
    share[Tithe_Hall,Mossgrave]  link[Tithe_Hall,Mossgrave]  1
    share[Tithe_Hall,Nettlecombe]  obj  12.1
    share[Tithe_Hall,Nettlecombe]  served[Nettlecombe]  1
    share[Tithe_Hall,Nettlecombe]  link[Tithe_Hall,Nettlecombe]  1
    share[Tithe_Hall,Orrin_Falls]  obj  102.3
    share[Tithe_Hall,Orrin_Falls]  served[Orrin_Falls]  1
    share[Tithe_Hall,Orrin_Falls]  link[Tithe_Hall,Orrin_Falls]  1
    share[Tithe_Hall,Pennyfold]  obj  44.6
    share[Tithe_Hall,Pennyfold]  served[Pennyfold]  1
    share[Tithe_Hall,Pennyfold]  link[Tithe_Hall,Pennyfold]  1
    share[Tithe_Hall,Quillsby]  obj  116.2
    share[Tithe_Hall,Quillsby]  served[Quillsby]  1
    share[Tithe_Hall,Quillsby]  link[Tithe_Hall,Quillsby]  1
    share[Tithe_Hall,Rookham]  obj  14.1
    share[Tithe_Hall,Rookham]  served[Rookham]  1
    share[Tithe_Hall,Rookham]  link[Tithe_Hall,Rookham]  1
    share[Tithe_Hall,Sallowmere]  obj  125.7
    share[Tithe_Hall,Sallowmere]  served[Sallowmere]  1
    share[Tithe_Hall,Sallowmere]  link[Tithe_Hall,Sallowmere]  1
    share[Tithe_Hall,Thistlegate]  obj  24.1
    share[Tithe_Hall,Thistlegate]  served[Thistlegate]  1
    share[Tithe_Hall,Thistlegate]  link[Tithe_Hall,Thistlegate]  1
    share[Tithe_Hall,Umberlow]  obj  28.4
    share[Tithe_Hall,Umberlow]  served[Umberlow]  1
    share[Tithe_Hall,Umberlow]  link[Tithe_Hall,Umberlow]  1
    share[Tithe_Hall,Vetch_Hollow]  obj  52.7
    share[Tithe_Hall,Vetch_Hollow]  served[Vetch_Hollow]  1
    share[Tithe_Hall,Vetch_Hollow]  link[Tithe_Hall,Vetch_Hollow]  1
    share[Tithe_Hall,Wrenfield]  obj  133.1
    share[Tithe_Hall,Wrenfield]  served[Wrenfield]  1
    share[Tithe_Hall,Wrenfield]  link[Tithe_Hall,Wrenfield]  1
    share[Tithe_Hall,Yarrowby]  obj  91.2
    share[Tithe_Hall,Yarrowby]  served[Yarrowby]  1
    share[Tithe_Hall,Yarrowby]  link[Tithe_Hall,Yarrowby]  1
    share[Kiln_Lane,Ashby_Wold]  obj  49.8
    share[Kiln_Lane,Ashby_Wold]  served[Ashby_Wold]  1
    share[Kiln_Lane,Ashby_Wold]  link[Kiln_Lane,Ashby_Wold]  1
    share[Kiln_Lane,Brackenmere]  obj  72.2
    share[Kiln_Lane,Brackenmere]  served[Brackenmere]  1
    share[Kiln_Lane,Brackenmere]  link[Kiln_Lane,Brackenmere]  1
    share[Kiln_Lane,Coldharbour_Edge]  obj  94.5
    share[Kiln_Lane,Coldharbour_Edge]  served[Coldharbour_Edge]  1
    share[Kiln_Lane,Coldharbour_Edge]  link[Kiln_Lane,Coldharbour_Edge]  1
    share[Kiln_Lane,Dunmoss]  obj  21.2
    share[Kiln_Lane,Dunmoss]  served[Dunmoss]  1
    share[Kiln_Lane,Dunmoss]  link[Kiln_Lane,Dunmoss]  1
    share[Kiln_Lane,Eelbrook]  obj  123.9
    share[Kiln_Lane,Eelbrook]  served[Eelbrook]  1
    share[Kiln_Lane,Eelbrook]  link[Kiln_Lane,Eelbrook]  1
    share[Kiln_Lane,Fennick_Cross]  obj  40.7
    share[Kiln_Lane,Fennick_Cross]  served[Fennick_Cross]  1
    share[Kiln_Lane,Fennick_Cross]  link[Kiln_Lane,Fennick_Cross]  1
    share[Kiln_Lane,Gorsedale]  obj  20.1
    share[Kiln_Lane,Gorsedale]  served[Gorsedale]  1
    share[Kiln_Lane,Gorsedale]  link[Kiln_Lane,Gorsedale]  1
    share[Kiln_Lane,Hollins_Tarn]  obj  37.2
    share[Kiln_Lane,Hollins_Tarn]  served[Hollins_Tarn]  1
    share[Kiln_Lane,Hollins_Tarn]  link[Kiln_Lane,Hollins_Tarn]  1
    share[Kiln_Lane,Inkpen_Vale]  obj  220.8
    share[Kiln_Lane,Inkpen_Vale]  served[Inkpen_Vale]  1
    share[Kiln_Lane,Inkpen_Vale]  link[Kiln_Lane,Inkpen_Vale]  1
    share[Kiln_Lane,Juniper_Lees]  obj  71.7
    share[Kiln_Lane,Juniper_Lees]  served[Juniper_Lees]  1
    share[Kiln_Lane,Juniper_Lees]  link[Kiln_Lane,Juniper_Lees]  1
    share[Kiln_Lane,Kestle_Moor]  obj  17
    share[Kiln_Lane,Kestle_Moor]  served[Kestle_Moor]  1
    share[Kiln_Lane,Kestle_Moor]  link[Kiln_Lane,Kestle_Moor]  1
    share[Kiln_Lane,Larkspur_Ford]  obj  12.3
    share[Kiln_Lane,Larkspur_Ford]  served[Larkspur_Ford]  1
    share[Kiln_Lane,Larkspur_Ford]  link[Kiln_Lane,Larkspur_Ford]  1
    share[Kiln_Lane,Mossgrave]  obj  95.1
    share[Kiln_Lane,Mossgrave]  served[Mossgrave]  1
    share[Kiln_Lane,Mossgrave]  link[Kiln_Lane,Mossgrave]  1
    share[Kiln_Lane,Nettlecombe]  obj  92.9
    share[Kiln_Lane,Nettlecombe]  served[Nettlecombe]  1
    share[Kiln_Lane,Nettlecombe]  link[Kiln_Lane,Nettlecombe]  1
    share[Kiln_Lane,Orrin_Falls]  obj  87.7
    share[Kiln_Lane,Orrin_Falls]  served[Orrin_Falls]  1
    share[Kiln_Lane,Orrin_Falls]  link[Kiln_Lane,Orrin_Falls]  1
    share[Kiln_Lane,Pennyfold]  obj  37.3
    share[Kiln_Lane,Pennyfold]  served[Pennyfold]  1
    share[Kiln_Lane,Pennyfold]  link[Kiln_Lane,Pennyfold]  1
    share[Kiln_Lane,Quillsby]  obj  193.4
    share[Kiln_Lane,Quillsby]  served[Quillsby]  1
    share[Kiln_Lane,Quillsby]  link[Kiln_Lane,Quillsby]  1
    share[Kiln_Lane,Rookham]  obj  32.4
    share[Kiln_Lane,Rookham]  served[Rookham]  1
    share[Kiln_Lane,Rookham]  link[Kiln_Lane,Rookham]  1
    share[Kiln_Lane,Sallowmere]  obj  143.9
    share[Kiln_Lane,Sallowmere]  served[Sallowmere]  1
    share[Kiln_Lane,Sallowmere]  link[Kiln_Lane,Sallowmere]  1
    share[Kiln_Lane,Thistlegate]  obj  18.1
    share[Kiln_Lane,Thistlegate]  served[Thistlegate]  1
    share[Kiln_Lane,Thistlegate]  link[Kiln_Lane,Thistlegate]  1
    share[Kiln_Lane,Umberlow]  obj  49.9
    share[Kiln_Lane,Umberlow]  served[Umberlow]  1
    share[Kiln_Lane,Umberlow]  link[Kiln_Lane,Umberlow]  1
    share[Kiln_Lane,Vetch_Hollow]  obj  69.9
    share[Kiln_Lane,Vetch_Hollow]  served[Vetch_Hollow]  1
    share[Kiln_Lane,Vetch_Hollow]  link[Kiln_Lane,Vetch_Hollow]  1
    share[Kiln_Lane,Wrenfield]  obj  238.5
    share[Kiln_Lane,Wrenfield]  served[Wrenfield]  1
    share[Kiln_Lane,Wrenfield]  link[Kiln_Lane,Wrenfield]  1
    share[Kiln_Lane,Yarrowby]  obj  56.6
    share[Kiln_Lane,Yarrowby]  served[Yarrowby]  1
    share[Kiln_Lane,Yarrowby]  link[Kiln_Lane,Yarrowby]  1
    share[Upper_Granary,Ashby_Wold]  obj  125.9
    share[Upper_Granary,Ashby_Wold]  served[Ashby_Wold]  1
    share[Upper_Granary,Ashby_Wold]  link[Upper_Granary,Ashby_Wold]  1
    share[Upper_Granary,Brackenmere]  obj  165.5
    share[Upper_Granary,Brackenmere]  served[Brackenmere]  1
    share[Upper_Granary,Brackenmere]  link[Upper_Granary,Brackenmere]  1
    share[Upper_Granary,Coldharbour_Edge]  obj  297.3
    share[Upper_Granary,Coldharbour_Edge]  served[Coldharbour_Edge]  1
    share[Upper_Granary,Coldharbour_Edge]  link[Upper_Granary,Coldharbour_Edge]  1
    share[Upper_Granary,Dunmoss]  obj  46.4
    share[Upper_Granary,Dunmoss]  served[Dunmoss]  1
    share[Upper_Granary,Dunmoss]  link[Upper_Granary,Dunmoss]  1
    share[Upper_Granary,Eelbrook]  obj  81.6
    share[Upper_Granary,Eelbrook]  served[Eelbrook]  1
    share[Upper_Granary,Eelbrook]  link[Upper_Granary,Eelbrook]  1
    share[Upper_Granary,Fennick_Cross]  obj  5.9
    share[Upper_Granary,Fennick_Cross]  served[Fennick_Cross]  1
    share[Upper_Granary,Fennick_Cross]  link[Upper_Granary,Fennick_Cross]  1
    share[Upper_Granary,Gorsedale]  obj  78.7
    share[Upper_Granary,Gorsedale]  served[Gorsedale]  1
    share[Upper_Granary,Gorsedale]  link[Upper_Granary,Gorsedale]  1
    share[Upper_Granary,Hollins_Tarn]  obj  115.5
    share[Upper_Granary,Hollins_Tarn]  served[Hollins_Tarn]  1
    share[Upper_Granary,Hollins_Tarn]  link[Upper_Granary,Hollins_Tarn]  1
    share[Upper_Granary,Inkpen_Vale]  obj  31.5
    share[Upper_Granary,Inkpen_Vale]  served[Inkpen_Vale]  1
    share[Upper_Granary,Inkpen_Vale]  link[Upper_Granary,Inkpen_Vale]  1
    share[Upper_Granary,Juniper_Lees]  obj  190
    share[Upper_Granary,Juniper_Lees]  served[Juniper_Lees]  1
    share[Upper_Granary,Juniper_Lees]  link[Upper_Granary,Juniper_Lees]  1
    share[Upper_Granary,Kestle_Moor]  obj  182.5
    share[Upper_Granary,Kestle_Moor]  served[Kestle_Moor]  1
    share[Upper_Granary,Kestle_Moor]  link[Upper_Granary,Kestle_Moor]  1
    share[Upper_Granary,Larkspur_Ford]  obj  47.7
    share[Upper_Granary,Larkspur_Ford]  served[Larkspur_Ford]  1
    share[Upper_Granary,Larkspur_Ford]  link[Upper_Granary,Larkspur_Ford]  1
    share[Upper_Granary,Mossgrave]  obj  89.5
    share[Upper_Granary,Mossgrave]  served[Mossgrave]  1
    share[Upper_Granary,Mossgrave]  link[Upper_Granary,Mossgrave]  1
    share[Upper_Granary,Nettlecombe]  obj  95.2
    share[Upper_Granary,Nettlecombe]  served[Nettlecombe]  1
    share[Upper_Granary,Nettlecombe]  link[Upper_Granary,Nettlecombe]  1
    share[Upper_Granary,Orrin_Falls]  obj  139.2
    share[Upper_Granary,Orrin_Falls]  served[Orrin_Falls]  1
    share[Upper_Granary,Orrin_Falls]  link[Upper_Granary,Orrin_Falls]  1
    share[Upper_Granary,Pennyfold]  obj  71.7
    share[Upper_Granary,Pennyfold]  served[Pennyfold]  1
    share[Upper_Granary,Pennyfold]  link[Upper_Granary,Pennyfold]  1
    share[Upper_Granary,Quillsby]  obj  46.1
    share[Upper_Granary,Quillsby]  served[Quillsby]  1
    share[Upper_Granary,Quillsby]  link[Upper_Granary,Quillsby]  1
    share[Upper_Granary,Rookham]  obj  23.5
    share[Upper_Granary,Rookham]  served[Rookham]  1
    share[Upper_Granary,Rookham]  link[Upper_Granary,Rookham]  1
    share[Upper_Granary,Sallowmere]  obj  166.9
    share[Upper_Granary,Sallowmere]  served[Sallowmere]  1
    share[Upper_Granary,Sallowmere]  link[Upper_Granary,Sallowmere]  1
    share[Upper_Granary,Thistlegate]  obj  36.8
    share[Upper_Granary,Thistlegate]  served[Thistlegate]  1
    share[Upper_Granary,Thistlegate]  link[Upper_Granary,Thistlegate]  1
    share[Upper_Granary,Umberlow]  obj  70.1
    share[Upper_Granary,Umberlow]  served[Umberlow]  1
    share[Upper_Granary,Umberlow]  link[Upper_Granary,Umberlow]  1
    share[Upper_Granary,Vetch_Hollow]  obj  74.1
    share[Upper_Granary,Vetch_Hollow]  served[Vetch_Hollow]  1
    share[Upper_Granary,Vetch_Hollow]  link[Upper_Granary,Vetch_Hollow]  1
    share[Upper_Granary,Wrenfield]  obj  34.8
    share[Upper_Granary,Wrenfield]  served[Wrenfield]  1
    share[Upper_Granary,Wrenfield]  link[Upper_Granary,Wrenfield]  1
    share[Upper_Granary,Yarrowby]  obj  169.7
    share[Upper_Granary,Yarrowby]  served[Yarrowby]  1
    share[Upper_Granary,Yarrowby]  link[Upper_Granary,Yarrowby]  1
RHS
    RHS  served[Ashby_Wold]  1
    RHS  served[Brackenmere]  1
    RHS  served[Coldharbour_Edge]  1
    RHS  served[Dunmoss]  1
    RHS  served[Eelbrook]  1
    RHS  served[Fennick_Cross]  1
    RHS  served[Gorsedale]  1
    RHS  served[Hollins_Tarn]  1
    RHS  served[Inkpen_Vale]  1
    RHS  served[Juniper_Lees]  1
    RHS  served[Kestle_Moor]  1
    RHS  served[Larkspur_Ford]  1
    RHS  served[Mossgrave]  1
    RHS  served[Nettlecombe]  1
    RHS  served[Orrin_Falls]  1
    RHS  served[Pennyfold]  1
    RHS  served[Quillsby]  1
    RHS  served[Rookham]  1
    RHS  served[Sallowmere]  1
    RHS  served[Thistlegate]  1
    RHS  served[Umberlow]  1
    RHS  served[Vetch_Hollow]  1
    RHS  served[Wrenfield]  1
    RHS  served[Yarrowby]  1
BOUNDS
 BV BND  open[North_Barn]
 BV BND  open[Millrace_Yard]
 BV BND  open[Old_Creamery]
 BV BND  open[Quarry_Shed]
 BV BND  open[Riverside_Store]
 BV BND  open[Tithe_Hall]
 BV BND  open[Kiln_Lane]
 BV BND  open[Upper_Granary]
 UP BND  share[North_Barn,Ashby_Wold]  1
 UP BND  share[North_Barn,Brackenmere]  1
 UP BND  share[North_Barn,Coldharbour_Edge]  1
 UP BND  share[North_Barn,Dunmoss]  1
 UP BND  share[North_Barn,Eelbrook]  1
 UP BND  share[North_Barn,Fennick_Cross]  1
 UP BND  share[North_Barn,Gorsedale]  1
 UP BND  share[North_Barn,Hollins_Tarn]  1
 UP BND  share[North_Barn,Inkpen_Vale]  1
 UP BND  share[North_Barn,Juniper_Lees]  1
 UP BND  share[North_Barn,Kestle_Moor]  1
 UP BND  share[North_Barn,Larkspur_Ford]  1
 UP BND  share[North_Barn,Mossgrave]  1
 UP BND  share[North_Barn,Nettlecombe]  1
 UP BND  share[North_Barn,Orrin_Falls]  1
 UP BND  share[North_Barn,Pennyfold]  1
 UP BND  share[North_Barn,Quillsby]  1
 UP BND  share[North_Barn,Rookham]  1
 UP BND  share[North_Barn,Sallowmere]  1
 UP BND  share[North_Barn,Thistlegate]  1
 UP BND  share[North_Barn,Umberlow]  1
 UP BND  share[North_Barn,Vetch_Hollow]  1
 UP BND  share[North_Barn,Wrenfield]  1
 UP BND  share[North_Barn,Yarrowby]  1
 UP BND  share[Millrace_Yard,Ashby_Wold]  1
 UP BND  share[Millrace_Yard,Brackenmere]  1
 UP BND  share[Millrace_Yard,Coldharbour_Edge]  1
 UP BND  share[Millrace_Yard,Dunmoss]  1
 UP BND  share[Millrace_Yard,Eelbrook]  1
 UP BND  share[Millrace_Yard,Fennick_Cross]  1
 UP BND  share[Millrace_Yard,Gorsedale]  1
 UP BND  share[Millrace_Yard,Hollins_Tarn]  1
 UP BND  share[Millrace_Yard,Inkpen_Vale]  1
 UP BND  share[Millrace_Yard,Juniper_Lees]  1
 UP BND  share[Millrace_Yard,Kestle_Moor]  1
 UP BND  share[Millrace_Yard,Larkspur_Ford]  1
 UP BND  share[Millrace_Yard,Mossgrave]  1
 UP BND  share[Millrace_Yard,Nettlecombe]  1
 UP BND  share[Millrace_Yard,Orrin_Falls]  1
 UP BND  share[Millrace_Yard,Pennyfold]  1
 UP BND  share[Millrace_Yard,Quillsby]  1
 UP BND  share[Millrace_Yard,Rookham]  1
 UP BND  share[Millrace_Yard,Sallowmere]  1
 UP BND  share[Millrace_Yard,Thistlegate]  1
 UP BND  share[Millrace_Yard,Umberlow]  1
 UP BND  share[Millrace_Yard,Vetch_Hollow]  1
 UP BND  share[Millrace_Yard,Wrenfield]  1
 UP BND  share[Millrace_Yard,Yarrowby]  1
 UP BND  share[Old_Creamery,Ashby_Wold]  1
 UP BND  share[Old_Creamery,Brackenmere]  1
 UP BND  share[Old_Creamery,Coldharbour_Edge]  1
 UP BND  share[Old_Creamery,Dunmoss]  1
 UP BND  share[Old_Creamery,Eelbrook]  1
 UP BND  share[Old_Creamery,Fennick_Cross]  1
 UP BND  share[Old_Creamery,Gorsedale]  1
 UP BND  share[Old_Creamery,Hollins_Tarn]  1
 UP BND  share[Old_Creamery,Inkpen_Vale]  1
 UP BND  share[Old_Creamery,Juniper_Lees]  1
 UP BND  share[Old_Creamery,Kestle_Moor]  1
 UP BND  share[Old_Creamery,Larkspur_Ford]  1
 UP BND  share[Old_Creamery,Mossgrave]  1
 UP BND  share[Old_Creamery,Nettlecombe]  1
 UP BND  share[Old_Creamery,Orrin_Falls]  1
 UP BND  share[Old_Creamery,Pennyfold]  1
 UP BND  share[Old_Creamery,Quillsby]  1
 UP BND  share[Old_Creamery,Rookham]  1
 UP BND  share[Old_Creamery,Sallowmere]  1
 UP BND  share[Old_Creamery,Thistlegate]  1
 UP BND  share[Old_Creamery,Umberlow]  1
 UP BND  share[Old_Creamery,Vetch_Hollow]  1
 UP BND  share[Old_Creamery,Wrenfield]  1
 UP BND  share[Old_Creamery,Yarrowby]  1
 UP BND  share[Quarry_Shed,Ashby_Wold]  1
 UP BND  share[Quarry_Shed,Brackenmere]  1
 UP BND  share[Quarry_Shed,Coldharbour_Edge]  1
 UP BND  share[Quarry_Shed,Dunmoss]  1
 UP BND  share[Quarry_Shed,Eelbrook]  1
 UP BND  share[Quarry_Shed,Fennick_Cross]  1
 UP BND  share[Quarry_Shed,Gorsedale]  1
 UP BND  share[Quarry_Shed,Hollins_Tarn]  1
 UP BND  share[Quarry_Shed,Inkpen_Vale]  1
 UP BND  share[Quarry_Shed,Juniper_Lees]  1
 UP BND  share[Quarry_Shed,Kestle_Moor]  1
 UP BND  share[Quarry_Shed,Larkspur_Ford]  1
 UP BND  share[Quarry_Shed,Mossgrave]  1
 UP BND  share[Quarry_Shed,Nettlecombe]  1
 UP BND  share[Quarry_Shed,Orrin_Falls]  1
 UP BND  share[Quarry_Shed,Pennyfold]  1
 UP BND  share[Quarry_Shed,Quillsby]  1
 UP BND  share[Quarry_Shed,Rookham]  1
 UP BND  share[Quarry_Shed,Sallowmere]  1
 UP BND  share[Quarry_Shed,Thistlegate]  1
 UP BND  share[Quarry_Shed,Umberlow]  1
 UP BND  share[Quarry_Shed,Vetch_Hollow]  1
 UP BND  share[Quarry_Shed,Wrenfield]  1
 UP BND  share[Quarry_Shed,Yarrowby]  1
 UP BND  share[Riverside_Store,Ashby_Wold]  1
 UP BND  share[Riverside_Store,Brackenmere]  1
 UP BND  share[Riverside_Store,Coldharbour_Edge]  1
 UP BND  share[Riverside_Store,Dunmoss]  1
 UP BND  share[Riverside_Store,Eelbrook]  1
 UP BND  share[Riverside_Store,Fennick_Cross]  1
 UP BND  share[Riverside_Store,Gorsedale]  1
 UP BND  share[Riverside_Store,Hollins_Tarn]  1
 UP BND  share[Riverside_Store,Inkpen_Vale]  1
 UP BND  share[Riverside_Store,Juniper_Lees]  1
 UP BND  share[Riverside_Store,Kestle_Moor]  1
 UP BND  share[Riverside_Store,Larkspur_Ford]  1
 UP BND  share[Riverside_Store,Mossgrave]  1
 UP BND  share[Riverside_Store,Nettlecombe]  1
 UP BND  share[Riverside_Store,Orrin_Falls]  1
 UP BND  share[Riverside_Store,Pennyfold]  1
 UP BND  share[Riverside_Store,Quillsby]  1
 UP BND  share[Riverside_Store,Rookham]  1
 UP BND  share[Riverside_Store,Sallowmere]  1
 UP BND  share[Riverside_Store,Thistlegate]  1
 UP BND  share[Riverside_Store,Umberlow]  1
 UP BND  share[Riverside_Store,Vetch_Hollow]  1
 UP BND  share[Riverside_Store,Wrenfield]  1
 UP BND  share[Riverside_Store,Yarrowby]  1
 UP BND  share[Tithe_Hall,Ashby_Wold]  1
 UP BND  share[Tithe_Hall,Brackenmere]  1
 UP BND  share[Tithe_Hall,Coldharbour_Edge]  1
 UP BND  share[Tithe_Hall,Dunmoss]  1
 UP BND  share[Tithe_Hall,Eelbrook]  1
 UP BND  share[Tithe_Hall,Fennick_Cross]  1
 UP BND  share[Tithe_Hall,Gorsedale]  1
 UP BND  share[Tithe_Hall,Hollins_Tarn]  1
 UP BND  share[Tithe_Hall,Inkpen_Vale]  1
 UP BND  share[Tithe_Hall,Juniper_Lees]  1
 UP BND  share[Tithe_Hall,Kestle_Moor]  1
 UP BND  share[Tithe_Hall,Larkspur_Ford]  1
 UP BND  share[Tithe_Hall,Mossgrave]  1
 UP BND  share[Tithe_Hall,Nettlecombe]  1
 UP BND  share[Tithe_Hall,Orrin_Falls]  1
 UP BND  share[Tithe_Hall,Pennyfold]  1
 UP BND  share[Tithe_Hall,Quillsby]  1
 UP BND  share[Tithe_Hall,Rookham]  1
 UP BND  share[Tithe_Hall,Sallowmere]  1
 UP BND  share[Tithe_Hall,Thistlegate]  1
 UP BND  share[Tithe_Hall,Umberlow]  1
 UP BND  share[Tithe_Hall,Vetch_Hollow]  1
 UP BND  share[Tithe_Hall,Wrenfield]  1
 UP BND  share[Tithe_Hall,Yarrowby]  1
 UP BND  share[Kiln_Lane,Ashby_Wold]  1
 UP BND  share[Kiln_Lane,Brackenmere]  1
 UP BND  share[Kiln_Lane,Coldharbour_Edge]  1
 UP BND  share[Kiln_Lane,Dunmoss]  1
 UP BND  share[Kiln_Lane,Eelbrook]  1
 UP BND  share[Kiln_Lane,Fennick_Cross]  1
 UP BND  share[Kiln_Lane,Gorsedale]  1
 UP BND  share[Kiln_Lane,Hollins_Tarn]  1
 UP BND  share[Kiln_Lane,Inkpen_Vale]  1
 UP BND  share[Kiln_Lane,Juniper_Lees]  1
 UP BND  share[Kiln_Lane,Kestle_Moor]  1
 UP BND  share[Kiln_Lane,Larkspur_Ford]  1
 UP BND  share[Kiln_Lane,Mossgrave]  1
 UP BND  share[Kiln_Lane,Nettlecombe]  1
 UP BND  share[Kiln_Lane,Orrin_Falls]  1
 UP BND  share[Kiln_Lane,Pennyfold]  1
 UP BND  share[Kiln_Lane,Quillsby]  1
 UP BND  share[Kiln_Lane,Rookham]  1
 UP BND  share[Kiln_Lane,Sallowmere]  1
 UP BND  share[Kiln_Lane,Thistlegate]  1
 UP BND  share[Kiln_Lane,Umberlow]  1
 UP BND  share[Kiln_Lane,Vetch_Hollow]  1
 UP BND  share[Kiln_Lane,Wrenfield]  1
 UP BND  share[Kiln_Lane,Yarrowby]  1
 UP BND  share[Upper_Granary,Ashby_Wold]  1
 UP BND  share[Upper_Granary,Brackenmere]  1
 UP BND  share[Upper_Granary,Coldharbour_Edge]  1
 UP BND  share[Upper_Granary,Dunmoss]  1
 UP BND  share[Upper_Granary,Eelbrook]  1
 UP BND  share[Upper_Granary,Fennick_Cross]  1
 UP BND  share[Upper_Granary,Gorsedale]  1
 UP BND  share[Upper_Granary,Hollins_Tarn]  1
 UP BND  share[Upper_Granary,Inkpen_Vale]  1
 UP BND  share[Upper_Granary,Juniper_Lees]  1
 UP BND  share[Upper_Granary,Kestle_Moor]  1
 UP BND  share[Upper_Granary,Larkspur_Ford]  1
 UP BND  share[Upper_Granary,Mossgrave]  1
 UP BND  share[Upper_Granary,Nettlecombe]  1
 UP BND  share[Upper_Granary,Orrin_Falls]  1
 UP BND  share[Upper_Granary,Pennyfold]  1
 UP BND  share[Upper_Granary,Quillsby]  1
 UP BND  share[Upper_Granary,Rookham]  1
 UP BND  share[Upper_Granary,Sallowmere]  1
 UP BND  share[Upper_Granary,Thistlegate]  1
 UP BND  share[Upper_Granary,Umberlow]  1
 UP BND  share[Upper_Granary,Vetch_Hollow]  1
 UP BND  share[Upper_Granary,Wrenfield]  1
 UP BND  share[Upper_Granary,Yarrowby]  1
ENDATA
